import { inject } from "vitest";
import type { CapturedMail } from "../../scripts/lib/mail-catcher";

/** Every message the catcher holds, newest first. */
export async function listMail(): Promise<CapturedMail[]> {
  const response = await fetch(`${inject("mailUrl")}/messages`);
  const body = (await response.json()) as { messages: CapturedMail[] };
  return body.messages;
}

/** Waits until a message to `to` matching `predicate` arrives (polls the catcher). */
export async function waitForMail(
  to: string,
  predicate: (mail: CapturedMail) => boolean = () => true,
  timeoutMs = 10_000,
): Promise<CapturedMail> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await listMail()).find((mail) => mail.envelopeTo.includes(to) && predicate(mail));
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`no mail to ${to} within ${timeoutMs} ms`);
    await new Promise((resolve) => setTimeout(resolve, 150));
  }
}

/** The first link in a message's text that starts with `prefix`. */
export function linkIn(mail: CapturedMail, prefix: string): string {
  const escaped = prefix.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  const match = mail.text.match(new RegExp(`${escaped}[^\\s)>"]*`));
  if (!match) throw new Error(`no link starting with ${prefix} in "${mail.subject}"`);
  return match[0];
}
