import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import axe from "axe-core";
import { chromium, type BrowserContext, type Page } from "playwright-core";

export const CHROMIUM_PATH = "/usr/bin/chromium";

const CHROMIUM_ARGS = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

export const SCREENSHOT_DIR = path.resolve(import.meta.dirname, "../e2e/screenshots");

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  /** Console errors and uncaught page errors seen so far (tests assert this stays empty). */
  errors: string[];
  close(): Promise<void>;
}

export interface OpenBrowserOptions {
  /** Viewport in CSS pixels; a laptop by default. */
  viewport?: { width: number; height: number };
  colorScheme?: "light" | "dark";
  /** Console messages matching one of these are not counted as errors. */
  ignoreConsole?: RegExp[];
}

/** Collects console errors and page errors of a page into `errors`. */
export function collectErrors(page: Page, errors: string[], ignore: RegExp[] = []): void {
  page.on("console", (message) => {
    if (message.type() !== "error") return;
    const text = message.text();
    if (ignore.some((pattern) => pattern.test(text))) return;
    errors.push(`console: ${text} (${message.location().url})`);
  });
  page.on("pageerror", (error) => {
    errors.push(`pageerror: ${error.message}`);
  });
}

/**
 * Launches Debian's Chromium with a fresh temporary profile (one per call, removed on close) and
 * opens one page whose console and page errors are collected.
 */
export async function openBrowser(options: OpenBrowserOptions = {}): Promise<BrowserSession> {
  const profile = mkdtempSync(path.join(os.tmpdir(), "peeksafe-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    args: CHROMIUM_ARGS,
    viewport: options.viewport ?? { width: 1280, height: 800 },
    colorScheme: options.colorScheme ?? "light",
  });
  const errors: string[] = [];
  const page = context.pages()[0] ?? (await context.newPage());
  collectErrors(page, errors, options.ignoreConsole);
  context.on("page", (extra) => collectErrors(extra, errors, options.ignoreConsole));
  return {
    context,
    page,
    errors,
    async close() {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    },
  };
}

/** Saves a full-page screenshot to tests/e2e/screenshots/<name>.png and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true });
  const file = path.join(SCREENSHOT_DIR, `${name.replace(/[^a-z0-9-]+/gi, "-")}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

export interface AxeViolation {
  id: string;
  impact: string | null;
  help: string;
  targets: string[];
}

/** Runs axe-core in the page and returns its serious and critical violations (empty when clean). */
export async function seriousAxeViolations(page: Page, options: { disableRules?: string[] } = {}): Promise<AxeViolation[]> {
  const hasAxe = await page.evaluate(() => typeof (window as unknown as { axe?: unknown }).axe !== "undefined");
  if (!hasAxe) await page.addScriptTag({ content: axe.source });
  const rules = Object.fromEntries((options.disableRules ?? []).map((id) => [id, { enabled: false }]));
  const results = await page.evaluate(async (ruleConfig) => {
    const runner = (window as unknown as { axe: typeof axe }).axe;
    const outcome = await runner.run(document, { rules: ruleConfig, resultTypes: ["violations"] });
    return outcome.violations.map((violation) => ({
      id: violation.id,
      impact: violation.impact ?? null,
      help: violation.help,
      targets: violation.nodes.map((node) => node.target.join(" ")),
    }));
  }, rules);
  return results.filter((violation) => violation.impact === "serious" || violation.impact === "critical");
}

/** Readable one-line-per-violation text for assertion messages. */
export function describeViolations(violations: AxeViolation[]): string {
  return violations.map((v) => `${v.impact} ${v.id}: ${v.help} at ${v.targets.join(", ")}`).join("\n");
}
