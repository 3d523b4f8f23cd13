import pino, { type Logger } from "pino";

const LEVELS = ["fatal", "error", "warn", "info", "debug", "trace", "silent"] as const;

function level(): string {
  const wanted = process.env.LOG_LEVEL;
  return wanted && (LEVELS as readonly string[]).includes(wanted) ? wanted : "info";
}

const globalForLogger = globalThis as unknown as { peeksafeLogger?: Logger };

/** The process's structured logger (JSON lines on stdout, level from `LOG_LEVEL`). */
export function getLogger(): Logger {
  globalForLogger.peeksafeLogger ??= pino({ level: level(), base: { app: "peeksafe", pid: process.pid } });
  return globalForLogger.peeksafeLogger;
}

/** A child logger tagged with the component that writes (`{ component: "recompute" }`). */
export function createLogger(component: string): Logger {
  return getLogger().child({ component });
}
