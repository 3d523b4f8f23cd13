"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { controlClasses } from "@/components/ui/input";
import { cn } from "@/components/ui/cn";
import { authClient } from "@/lib/auth/client";
import { hardNavigate } from "./hard-navigate";

export interface WorkspaceChoice {
  id: string;
  name: string;
  role: string;
}

/** Shows the active workspace and switches to another of the user's memberships. */
export function WorkspaceSwitcher({ workspaces, activeId }: { workspaces: WorkspaceChoice[]; activeId: string }) {
  const router = useRouter();
  const id = useId();
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);

  async function onChange(value: string) {
    if (value === "__new") {
      router.push("/workspaces/new");
      return;
    }
    setPending(true);
    setError(null);
    const result = await authClient.organization.setActive({ organizationId: value });
    setPending(false);
    if (result.error) {
      setError("Could not switch workspace. Try again.");
      return;
    }
    hardNavigate("/campaigns");
  }

  return (
    <div className="min-w-0">
      <label htmlFor={id} className="sr-only">
        Workspace
      </label>
      <select
        id={id}
        value={activeId}
        disabled={pending}
        onChange={(event) => void onChange(event.target.value)}
        className={cn(controlClasses, "max-w-[14rem] truncate py-1.5 pr-8 font-medium")}
      >
        {workspaces.map((workspace) => (
          <option key={workspace.id} value={workspace.id}>
            {workspace.name} ({workspace.role})
          </option>
        ))}
        <option value="__new">New workspace…</option>
      </select>
      {error ? (
        <p role="alert" className="mt-1 text-xs text-red-700 dark:text-red-300">
          {error}
        </p>
      ) : null}
    </div>
  );
}
