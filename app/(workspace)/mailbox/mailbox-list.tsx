"use client";

import { useState } from "react";
import { Card } from "@/components/ui/card";
import { cn } from "@/components/ui/cn";
import { EmptyState } from "@/components/ui/empty-state";
import { Notice } from "@/components/ui/notice";
import { useMail, type MailboxMessage } from "@/lib/hooks/use-mail";

const received = new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "medium" });

function MessageView({ message }: { message: MailboxMessage }) {
  return (
    <Card as="article" aria-labelledby="mail-subject" className="min-w-0 space-y-4">
      <div>
        <h2 id="mail-subject" className="text-lg font-semibold">
          {message.subject || "(no subject)"}
        </h2>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1 text-sm">
          <dt className="text-tremor-content dark:text-dark-tremor-content">From</dt>
          <dd className="break-all">{message.from}</dd>
          <dt className="text-tremor-content dark:text-dark-tremor-content">To</dt>
          <dd className="break-all">{message.to.join(", ") || message.envelopeTo.join(", ")}</dd>
          <dt className="text-tremor-content dark:text-dark-tremor-content">Received</dt>
          <dd>{received.format(new Date(message.receivedAt))}</dd>
        </dl>
      </div>
      {message.html ? (
        <section aria-label="HTML version">
          <h3 className="mb-2 text-sm font-semibold">As HTML</h3>
          {/* An empty sandbox: the message's scripts, forms and same-origin access are all off. */}
          <iframe sandbox="" srcDoc={message.html} title={`HTML body of ${message.subject}`} className="h-96 w-full rounded border border-tremor-border bg-white dark:border-dark-tremor-border" />
        </section>
      ) : null}
      <section aria-label="Plain-text version">
        <h3 className="mb-2 text-sm font-semibold">As plain text</h3>
        <pre tabIndex={0} aria-label="Plain text of the message" className="max-h-96 overflow-auto whitespace-pre-wrap break-words rounded bg-tremor-background-subtle p-3 font-mono text-xs dark:bg-dark-tremor-background-subtle">
          {message.text}
        </pre>
      </section>
    </Card>
  );
}

export function MailboxList() {
  const { data, error, isLoading } = useMail();
  const [selectedId, setSelectedId] = useState<string | null>(null);

  if (error) return <Notice tone="error" title="Mailbox unavailable">{error instanceof Error ? error.message : "Try again."}</Notice>;
  if (isLoading || !data) return <p className="text-sm text-tremor-content dark:text-dark-tremor-content">Loading the mailbox…</p>;
  if (data.length === 0) return <EmptyState title="No mail yet" description="Sign-up confirmations, invitations and campaign alerts appear here." />;

  const selected = data.find((message) => message.id === selectedId) ?? data[0];
  return (
    <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
      <nav aria-label="Messages" className="min-w-0">
        <ul className="divide-y divide-tremor-border overflow-hidden rounded-tremor-default border border-tremor-border bg-white dark:divide-dark-tremor-border dark:border-dark-tremor-border dark:bg-dark-tremor-background">
          {data.map((message) => {
            const current = message.id === selected.id;
            return (
              <li key={message.id}>
                <button
                  type="button"
                  aria-current={current ? "true" : undefined}
                  onClick={() => setSelectedId(message.id)}
                  className={cn(
                    "block w-full px-4 py-3 text-left hover:bg-tremor-background-subtle dark:hover:bg-dark-tremor-background-subtle",
                    current && "border-l-4 border-pine-600 bg-pine-50 dark:bg-pine-950",
                  )}
                >
                  <span className="block truncate text-sm font-medium">{message.subject || "(no subject)"}</span>
                  <span className="block truncate text-xs text-tremor-content dark:text-dark-tremor-content">
                    To {message.to.join(", ") || message.envelopeTo.join(", ")}
                  </span>
                  <span className="block text-xs text-tremor-content dark:text-dark-tremor-content">{received.format(new Date(message.receivedAt))}</span>
                </button>
              </li>
            );
          })}
        </ul>
      </nav>
      <MessageView message={selected} />
    </div>
  );
}
