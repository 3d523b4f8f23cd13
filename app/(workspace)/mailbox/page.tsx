import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requireWorkspace } from "@/lib/auth/session";
import { isMailCatcherEnabled } from "@/lib/env";
import { MailboxList } from "./mailbox-list";

export const metadata: Metadata = { title: "Mailbox" };

export default async function MailboxPage() {
  await requireWorkspace();
  if (!isMailCatcherEnabled()) notFound();
  return (
    <div className="space-y-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Mailbox</h1>
        <p className="mt-1 text-sm text-tremor-content dark:text-dark-tremor-content">
          Every e-mail Peeksafe sent on this machine, caught by the local mail server. Nothing here left the machine. Refreshes every 3 seconds.
        </p>
      </div>
      <MailboxList />
    </div>
  );
}
