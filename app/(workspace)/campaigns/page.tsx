import type { Metadata } from "next";
import Link from "next/link";
import { connection } from "next/server";
import { Badge, Card, EmptyState, Table, Td, Th, buttonClasses } from "@/components/ui";
import { listCampaigns } from "@/db/queries/campaigns";
import { CAMPAIGN_STATUSES, type CampaignStatus } from "@/db/schema/campaigns";
import { requireRole } from "@/lib/auth/session";
import { roleAllows } from "@/lib/auth/permissions";
import { STATUS_LABELS } from "@/lib/campaigns/lifecycle";

export const metadata: Metadata = { title: "Campaigns · Peeksafe" };

export default async function CampaignsPage({ searchParams }: { searchParams: Promise<{ status?: string }> }) {
  await connection();
  const { membership } = await requireRole({ campaign: ["read"] });
  const { status } = await searchParams;
  const filter = CAMPAIGN_STATUSES.includes(status as CampaignStatus) ? (status as CampaignStatus) : undefined;
  const campaigns = await listCampaigns(membership.workspaceId, { status: filter });
  const canCreate = roleAllows(membership.role, { campaign: ["create"] });
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-xl font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">Campaigns</h1>
        {canCreate ? (
          <Link href="/campaigns/new" className={buttonClasses()}>
            New campaign
          </Link>
        ) : null}
      </div>
      <nav aria-label="Filter by status" className="flex flex-wrap gap-2 text-sm">
        {[undefined, ...CAMPAIGN_STATUSES].map((value) => (
          <Link
            key={value ?? "all"}
            href={value ? `/campaigns?status=${value}` : "/campaigns"}
            aria-current={filter === value ? "page" : undefined}
            className={buttonClasses(filter === value ? "primary" : "secondary", "sm")}
          >
            {value ? STATUS_LABELS[value] : "All"}
          </Link>
        ))}
      </nav>
      <Card>
        {campaigns.length === 0 ? (
          <EmptyState title="No campaigns yet" description="Register a campaign to plan its holdout test." />
        ) : (
          <Table caption="Campaigns of this workspace">
            <thead>
              <tr>
                <Th>Campaign</Th>
                <Th>Status</Th>
                <Th>Metric</Th>
                <Th numeric>Holdout</Th>
                <Th numeric>Planned units</Th>
                <Th numeric>Planned days</Th>
                <Th>Start</Th>
              </tr>
            </thead>
            <tbody>
              {campaigns.map((campaign) => (
                <tr key={campaign.id}>
                  <Td>
                    <Link href={`/campaigns/${campaign.id}`} className="font-medium text-pine-800 hover:underline dark:text-pine-300">
                      {campaign.name}
                    </Link>
                    {campaign.planChangedAt ? (
                      <Badge tone="warning" className="ml-2">
                        Plan changed mid-flight
                      </Badge>
                    ) : null}
                  </Td>
                  <Td>
                    <Badge>{STATUS_LABELS[campaign.status]}</Badge>
                  </Td>
                  <Td>{campaign.metric.name}</Td>
                  <Td numeric>{((campaign.arms.find((arm) => arm.isHoldout)?.share ?? 0) * 100).toFixed(0)} %</Td>
                  <Td numeric>{campaign.plan.total.toLocaleString("en-US")}</Td>
                  <Td numeric>{campaign.plan.days === null ? "—" : `${campaign.plan.days} d`}</Td>
                  <Td>{campaign.startDate}</Td>
                </tr>
              ))}
            </tbody>
          </Table>
        )}
      </Card>
    </div>
  );
}
