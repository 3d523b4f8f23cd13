import { z } from "zod";

const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  DATABASE_URL: z.string().url(),
  BETTER_AUTH_SECRET: z.string().min(32, "BETTER_AUTH_SECRET must be at least 32 characters"),
  APP_URL: z.string().url().default("http://127.0.0.1:3000"),
  SMTP_URL: z.string().url().default("smtp://127.0.0.1:1025"),
  MAIL_CATCHER_URL: z.string().url().optional(),
  MAIL_FROM: z.string().default("Peeksafe <alerts@peeksafe.local>"),
  CRON_SECRET: z.string().min(16).optional(),
  SECURE_COOKIES: z.enum(["true", "false"]).optional(),
  AUTH_RATE_LIMIT: z.enum(["on", "off"]).default("on"),
  INGEST_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(4),
  LOG_LEVEL: z.enum(["fatal", "error", "warn", "info", "debug", "trace", "silent"]).default("info"),
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

/** The validated environment; throws on first use when a variable is missing or malformed. */
export function getEnv(): Env {
  if (!cached) {
    const parsed = envSchema.safeParse(process.env);
    if (!parsed.success) {
      const lines = parsed.error.issues.map((issue) => `  ${issue.path.join(".")}: ${issue.message}`);
      throw new Error(`Invalid environment:\n${lines.join("\n")}`);
    }
    cached = parsed.data;
  }
  return cached;
}

/** The local mail catcher is in use when it is configured and SMTP points at loopback. */
export function isMailCatcherEnabled(): boolean {
  const env = getEnv();
  if (!env.MAIL_CATCHER_URL) return false;
  const host = new URL(env.SMTP_URL).hostname;
  return host === "127.0.0.1" || host === "localhost";
}
