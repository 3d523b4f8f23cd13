"use client";

import { Button } from "@/components/ui/button";
import { cancelInvitationAction } from "../actions";
import { useAction } from "./use-action";

export function CancelInvitationButton({ invitationId, email }: { invitationId: string; email: string }) {
  const action = useAction(cancelInvitationAction);
  return (
    <span className="inline-flex flex-col items-end gap-1">
      <Button variant="secondary" size="sm" pending={action.pending} aria-label={`Cancel the invitation of ${email}`} onClick={() => void action.run({ invitationId })}>
        Cancel
      </Button>
      {action.error ? (
        <span role="alert" className="text-xs text-red-700 dark:text-red-300">
          Error: {action.error}
        </span>
      ) : null}
    </span>
  );
}
