import nodemailer, { type Transporter } from "nodemailer";
import { getEnv } from "@/lib/env";

const globalForMail = globalThis as unknown as { peeksafeTransport?: Transporter };

/** One pooled SMTP transport per process, pointed at `SMTP_URL` (the local catcher by default). */
export function getTransport(): Transporter {
  globalForMail.peeksafeTransport ??= nodemailer.createTransport(getEnv().SMTP_URL, {
    from: getEnv().MAIL_FROM,
  });
  return globalForMail.peeksafeTransport;
}

export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html: string;
  messageId?: string;
  headers?: Record<string, string>;
}

/** Sends one message over SMTP; rejects when the server refuses it or cannot be reached. */
export async function sendMail(mail: OutgoingMail): Promise<void> {
  await getTransport().sendMail({ from: getEnv().MAIL_FROM, ...mail });
}

/** Forgets the cached transport (used when SMTP settings change in tests). */
export function resetTransport(): void {
  globalForMail.peeksafeTransport?.close();
  globalForMail.peeksafeTransport = undefined;
}
