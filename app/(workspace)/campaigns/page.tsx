import type { Metadata } from "next";
import Link from "next/link";
import { connection } from "next/server";
import { Portfolio } from "@/components/dashboard/portfolio";
import { buttonClasses } from "@/components/ui";
import { listPortfolio } from "@/db/queries/portfolio";
import { roleAllows } from "@/lib/auth/permissions";
import { requirePageRole } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Campaigns · Peeksafe" };

/** The portfolio: every campaign of the workspace with its call, polled. */
export default async function CampaignsPage() {
  await connection();
  const { membership } = await requirePageRole({ campaign: ["read"] });
  const campaigns = await listPortfolio(membership.workspaceId);
  const canCreate = roleAllows(membership.role, { campaign: ["create"] });
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h1 className="text-xl font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">Campaigns</h1>
          <p className="mt-1 text-sm text-tremor-content dark:text-dark-tremor-content">Every campaign with its call. Calls use always-valid statistics: look as often as you like.</p>
        </div>
        {canCreate ? (
          <Link href="/campaigns/new" className={buttonClasses()}>
            New campaign
          </Link>
        ) : null}
      </div>
      <Portfolio initial={campaigns} canCreate={canCreate} />
    </div>
  );
}
