import pino from "pino";
import { describe, expect, it } from "vitest";
import { createAuthLog } from "@/lib/auth/auth-logger";

function capture() {
  const lines: { level: number; msg: string; err?: unknown }[] = [];
  const logger = pino({ level: "trace" }, { write: (line: string) => void lines.push(JSON.parse(line)) });
  return { lines, log: createAuthLog(logger) };
}

describe("createAuthLog", () => {
  it("logs a refused API key (a 401 better-auth logs as an error) at debug, not error", () => {
    const { lines, log } = capture();
    const refused = Object.assign(new Error("Invalid API key."), { status: "UNAUTHORIZED", statusCode: 401 });
    log("error", "Failed to validate API key:", refused);
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatchObject({ level: 20, msg: "Failed to validate API key:" });
  });

  it("keeps a server-side failure an error, with its error attached", () => {
    const { lines, log } = capture();
    log("error", "Failed to delete expired API keys:", new Error("connection terminated"));
    expect(lines[0]).toMatchObject({ level: 50, msg: "Failed to delete expired API keys:" });
    expect(lines[0].err).toMatchObject({ message: "connection terminated" });
  });

  it("passes warnings through at warn", () => {
    const { lines, log } = capture();
    log("warn", "Rate limit exceeded", { path: "/sign-in/email" });
    expect(lines[0]).toMatchObject({ level: 40, msg: "Rate limit exceeded" });
  });
});
