"use client";

import Link from "next/link";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { authClient } from "@/lib/auth/client";
import { hardNavigate } from "@/components/shell/hard-navigate";

export function InvitationAnswer({ invitationId, workspaceId, workspaceName }: { invitationId: string; workspaceId: string; workspaceName: string }) {
  const [pending, setPending] = useState<"accept" | "decline" | null>(null);
  const [declined, setDeclined] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function accept() {
    setPending("accept");
    setError(null);
    const result = await authClient.organization.acceptInvitation({ invitationId });
    if (result.error) {
      setPending(null);
      setError("The invitation could not be accepted. It may have expired or been cancelled.");
      return;
    }
    await authClient.organization.setActive({ organizationId: workspaceId });
    hardNavigate("/settings");
  }

  async function decline() {
    setPending("decline");
    setError(null);
    const result = await authClient.organization.rejectInvitation({ invitationId });
    setPending(null);
    if (result.error) {
      setError("The invitation could not be declined. Try again.");
      return;
    }
    setDeclined(true);
  }

  if (declined) {
    return (
      <Notice tone="info" title="Invitation declined">
        You did not join {workspaceName}.{" "}
        <Link href="/" className="underline underline-offset-2">
          Continue
        </Link>
      </Notice>
    );
  }

  return (
    <div className="space-y-4">
      {error ? <Notice tone="error">{error}</Notice> : null}
      <div className="flex flex-wrap gap-3">
        <Button onClick={() => void accept()} pending={pending === "accept"} disabled={pending !== null}>
          Accept and join
        </Button>
        <Button variant="secondary" onClick={() => void decline()} pending={pending === "decline"} disabled={pending !== null}>
          Decline
        </Button>
      </div>
    </div>
  );
}
