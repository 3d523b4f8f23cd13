"use client";

import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { Select } from "@/components/ui/input";
import { ROLE_NAMES } from "@/lib/auth/permissions";
import { removeMemberAction, updateMemberRoleAction } from "../actions";
import { useAction } from "./use-action";

/** An admin's controls on one member row: change the role, remove (with a confirmation step). */
export function MemberControls({ memberId, name, role, isSelf }: { memberId: string; name: string; role: string; isSelf: boolean }) {
  const id = useId();
  const update = useAction(updateMemberRoleAction);
  const remove = useAction(removeMemberAction);
  const [confirming, setConfirming] = useState(false);
  const error = update.error ?? remove.error;

  return (
    <div className="flex flex-col items-end gap-1">
      <div className="flex flex-wrap items-center justify-end gap-2">
        <label htmlFor={id} className="sr-only">
          Role of {name}
        </label>
        <Select
          id={id}
          defaultValue={role}
          disabled={update.pending}
          className="w-32 py-1"
          onChange={(event) => void update.run({ memberId, role: event.target.value })}
        >
          {ROLE_NAMES.map((name) => (
            <option key={name} value={name}>
              {name}
            </option>
          ))}
        </Select>
        {confirming ? (
          <>
            <Button variant="danger" size="sm" pending={remove.pending} onClick={() => void remove.run({ memberId }).then(() => setConfirming(false))}>
              {isSelf ? "Yes, leave" : `Yes, remove ${name}`}
            </Button>
            <Button variant="ghost" size="sm" onClick={() => setConfirming(false)}>
              Keep
            </Button>
          </>
        ) : (
          <Button variant="secondary" size="sm" onClick={() => setConfirming(true)} aria-label={isSelf ? "Leave the workspace" : `Remove ${name}`}>
            {isSelf ? "Leave" : "Remove"}
          </Button>
        )}
      </div>
      {error ? (
        <p role="alert" className="max-w-xs text-right text-xs text-red-700 dark:text-red-300">
          Error: {error}
        </p>
      ) : null}
    </div>
  );
}
