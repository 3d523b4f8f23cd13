"use client";

import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { moveCampaignAction } from "@/app/(workspace)/campaigns/actions";
import { Button, Notice } from "@/components/ui";
import type { CampaignStatus } from "@/db/schema/campaigns";

const MOVE_LABELS: Record<CampaignStatus, string> = {
  draft: "Back to draft",
  running: "Start",
  paused: "Pause",
  ended: "End",
  archived: "Archive",
};

/** The lifecycle moves open from the current status; the server checks the role and the rules again. */
export function LifecycleButtons({ campaignId, moves }: { campaignId: string; moves: readonly CampaignStatus[] }) {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [error, setError] = useState<string | null>(null);
  if (moves.length === 0) return null;
  return (
    <div className="flex flex-wrap items-center gap-2">
      {moves.map((status) => (
        <Button
          key={status}
          size="sm"
          variant={status === "running" ? "primary" : "secondary"}
          pending={pending}
          onClick={() =>
            startTransition(async () => {
              const result = await moveCampaignAction(campaignId, status);
              if (result.ok) {
                setError(null);
                router.refresh();
              } else setError(result.error);
            })
          }
        >
          {MOVE_LABELS[status]}
        </Button>
      ))}
      {error ? <Notice tone="error" title={error} /> : null}
    </div>
  );
}
