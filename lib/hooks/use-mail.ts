"use client";

import useSWR from "swr";

/** One message of the local mail catcher, as GET /api/dev/mail returns it. */
export interface MailboxMessage {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  envelopeTo: string[];
  subject: string;
  text: string;
  html: string | null;
}

export const MAIL_KEY = "/api/dev/mail";
export const MAIL_POLL_MS = 3000;

async function fetchMail(url: string): Promise<MailboxMessage[]> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  if (!response.ok) throw new Error(`The mailbox answered ${response.status}.`);
  const body = (await response.json()) as { messages?: MailboxMessage[] };
  return [...(body.messages ?? [])].sort((a, b) => b.receivedAt.localeCompare(a.receivedAt));
}

/** The local mailbox, newest first, polled every 3 s. */
export function useMail() {
  return useSWR(MAIL_KEY, fetchMail, { refreshInterval: MAIL_POLL_MS, dedupingInterval: MAIL_POLL_MS - 1000, revalidateOnFocus: true });
}
