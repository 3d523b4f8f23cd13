import type { Logger as PinoLogger } from "pino";
import { createLogger } from "@/lib/logger";

type AuthLogLevel = "debug" | "info" | "warn" | "error";

/** A status the client caused (a wrong or revoked key, a bad password), read off what better-auth logs beside its message. */
function clientFault(args: unknown[]): boolean {
  return args.some((arg) => {
    const status = arg && typeof arg === "object" ? (arg as { statusCode?: unknown }).statusCode : undefined;
    return typeof status === "number" && status >= 400 && status < 500;
  });
}

/**
 * better-auth's log lines through the app's structured logger. A refused credential is the client's fault,
 * not ours: better-auth logs every wrong API key as an error, which would bury real ones, so those go to debug.
 */
export function createAuthLog(logger: PinoLogger = createLogger("auth")) {
  return (level: AuthLogLevel, message: string, ...args: unknown[]): void => {
    const effective: AuthLogLevel = level === "error" && clientFault(args) ? "debug" : level;
    const errors = args.filter((arg): arg is Error => arg instanceof Error);
    const fields = errors.length > 0 ? { err: errors[0] } : args.length > 0 ? { details: args } : {};
    logger[effective](fields, message);
  };
}
