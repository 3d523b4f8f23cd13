import type { Metadata } from "next";
import Link from "next/link";
import { CenteredCard } from "@/components/shell/centered-layout";
import { listMemberships } from "@/db/queries/members";
import { requireUser } from "@/lib/auth/session";
import { listTimeZones } from "@/lib/validation/workspace";
import { CreateWorkspaceForm } from "./create-workspace-form";

export const metadata: Metadata = { title: "New workspace" };

export default async function NewWorkspacePage() {
  const session = await requireUser();
  const memberships = await listMemberships(session.user.id);
  return (
    <CenteredCard
      title="Set up your workspace"
      description="A workspace holds your team's campaigns, members and pipeline keys. You can rename it later."
    >
      <CreateWorkspaceForm timeZones={listTimeZones()} />
      {memberships.length > 0 ? (
        <p className="mt-5 text-sm">
          <Link href="/campaigns" className="text-pine-700 underline underline-offset-2 dark:text-pine-300">
            Back to {memberships[0].workspaceName}
          </Link>
        </p>
      ) : (
        <p className="mt-5 text-sm text-tremor-content dark:text-dark-tremor-content">
          Joining a colleague&apos;s workspace instead? Open the invitation link from your mailbox.
        </p>
      )}
    </CenteredCard>
  );
}
