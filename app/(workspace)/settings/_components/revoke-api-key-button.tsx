"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { revokeApiKeyAction } from "../actions";
import { useAction } from "./use-action";

/** Revokes a key after an explicit second step; a revoked key stops working at once. */
export function RevokeApiKeyButton({ keyId, name }: { keyId: string; name: string }) {
  const action = useAction(revokeApiKeyAction);
  const [confirming, setConfirming] = useState(false);
  return (
    <span className="inline-flex flex-col items-end gap-1">
      {confirming ? (
        <span className="inline-flex flex-wrap justify-end gap-2">
          <span className="self-center text-xs">Pipelines using it stop at once.</span>
          <Button variant="danger" size="sm" pending={action.pending} onClick={() => void action.run({ keyId }).then(() => setConfirming(false))}>
            Yes, revoke {name}
          </Button>
          <Button variant="ghost" size="sm" onClick={() => setConfirming(false)}>
            Keep
          </Button>
        </span>
      ) : (
        <Button variant="secondary" size="sm" aria-label={`Revoke ${name}`} onClick={() => setConfirming(true)}>
          Revoke
        </Button>
      )}
      {action.error ? (
        <span role="alert" className="text-xs text-red-700 dark:text-red-300">
          Error: {action.error}
        </span>
      ) : null}
    </span>
  );
}
