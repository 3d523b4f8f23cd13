import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { connection } from "next/server";
import { CsvUpload } from "@/components/campaigns/csv-upload";
import { LifecycleButtons } from "@/components/campaigns/lifecycle-buttons";
import { Badge, Card, CardHeader, EmptyState, Notice, Table, Td, Th } from "@/components/ui";
import { getCampaign } from "@/db/queries/campaigns";
import { listDailyCounts } from "@/db/queries/daily-counts";
import { roleAllows } from "@/lib/auth/permissions";
import { requireRole } from "@/lib/auth/session";
import { LIFECYCLE_MOVES, STATUS_LABELS } from "@/lib/campaigns/lifecycle";

export const metadata: Metadata = { title: "Campaign · Peeksafe" };

const percent = (value: number, digits = 1) => `${(value * 100).toFixed(digits)} %`;
const whole = (value: number) => value.toLocaleString("en-US");

export default async function CampaignPage({ params }: { params: Promise<{ id: string }> }) {
  await connection();
  const { membership } = await requireRole({ campaign: ["read"] });
  const { id } = await params;
  const campaign = await getCampaign(membership.workspaceId, decodeURIComponent(id));
  if (!campaign) notFound();
  const counts = await listDailyCounts(campaign.id);
  const canUpload = roleAllows(membership.role, { campaign: ["upload"] }) && campaign.status !== "archived";
  const canMove = roleAllows(membership.role, { campaign: ["lifecycle"] });
  const unit = campaign.metric.unit ? ` ${campaign.metric.unit}` : "";
  const byDay = new Map<string, Map<string, (typeof counts)[number]>>();
  for (const count of counts) {
    const day = byDay.get(count.day) ?? new Map();
    day.set(count.arm, count);
    byDay.set(count.day, day);
  }
  const days = [...byDay.keys()].sort().reverse();

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div>
          <h1 className="text-xl font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">{campaign.name}</h1>
          <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-tremor-content">
            <Badge>{STATUS_LABELS[campaign.status]}</Badge>
            <span>
              {campaign.metric.name} · started {campaign.startDate} · at most {campaign.maxDays} days · <code>{campaign.slug}</code>
            </span>
          </p>
        </div>
        {canMove ? <LifecycleButtons campaignId={campaign.id} moves={LIFECYCLE_MOVES[campaign.status]} /> : null}
      </div>

      {campaign.planChangedAt ? (
        <Notice tone="warning" title="The plan changed mid-flight">
          An admin changed the plan on {campaign.planChangedAt.slice(0, 10)} after counts had arrived; the reason is in the audit log. Read every number below with that in mind.
        </Notice>
      ) : null}

      {campaign.hypothesis ? <p className="max-w-3xl text-sm">{campaign.hypothesis}</p> : null}

      <Card aria-labelledby="plan-title">
        <CardHeader id="plan-title" title="Plan" description="Fixed when registered; locked once counts arrive." />
        <div className="grid gap-6 md:grid-cols-2">
          <dl className="grid grid-cols-2 gap-x-4 gap-y-2 text-sm">
            <dt>Metric</dt>
            <dd>{campaign.metric.kind === "conversion" ? "Conversion" : `Mean per unit${unit}`}</dd>
            <dt>Baseline</dt>
            <dd className="tabular-nums">
              {campaign.metric.kind === "conversion" ? percent(campaign.baselineRate ?? 0, 2) : `${campaign.baselineMean}${unit} (σ ${campaign.baselineSd}${unit})`}
            </dd>
            <dt>Minimum lift worth detecting</dt>
            <dd className="tabular-nums">{percent(campaign.minimumLift)} relative</dd>
            <dt>Significance level α</dt>
            <dd className="tabular-nums">{campaign.alpha}</dd>
            <dt>Power</dt>
            <dd className="tabular-nums">{percent(campaign.power, 0)}</dd>
            <dt>Sidedness</dt>
            <dd>{campaign.sides === 2 ? "Two-sided" : "One-sided"}</dd>
            <dt>Always-valid tuning τ</dt>
            <dd className="tabular-nums">{campaign.tau.toPrecision(3)}</dd>
          </dl>
          <Table caption="Planned units per arm" className="min-w-0">
            <thead>
              <tr>
                <Th>Arm</Th>
                <Th numeric>Share</Th>
                <Th numeric>Units needed</Th>
              </tr>
            </thead>
            <tbody>
              {campaign.arms.map((arm) => (
                <tr key={arm.key}>
                  <Td>
                    {arm.name} <code className="text-xs">{arm.key}</code>
                  </Td>
                  <Td numeric>{percent(arm.share, 0)}</Td>
                  <Td numeric>{whole(campaign.plan.perArm[arm.key] ?? 0)}</Td>
                </tr>
              ))}
              <tr>
                <Td className="font-medium">Total</Td>
                <Td numeric>100 %</Td>
                <Td numeric className="font-medium">
                  {whole(campaign.plan.total)} {campaign.plan.days === null ? "" : `· ${campaign.plan.days} days`}
                </Td>
              </tr>
            </tbody>
          </Table>
        </div>
      </Card>

      <Card aria-labelledby="counts-title">
        <CardHeader id="counts-title" title="Daily counts" description="Each day's new units and outcomes per arm, newest first." />
        {days.length === 0 ? (
          <EmptyState title="No counts yet" description="The pipeline pushes them through the ingest API, or upload a CSV below." />
        ) : (
          <Table caption="Daily counts per arm">
            <thead>
              <tr>
                <Th>Day</Th>
                {campaign.arms.map((arm) => (
                  <Th key={arm.key} numeric colSpan={1}>
                    {arm.name}: units / {campaign.metric.kind === "conversion" ? "conversions" : `sum${unit}`}
                  </Th>
                ))}
              </tr>
            </thead>
            <tbody>
              {days.map((day) => (
                <tr key={day}>
                  <Td>{day}</Td>
                  {campaign.arms.map((arm) => {
                    const count = byDay.get(day)!.get(arm.key);
                    return (
                      <Td key={arm.key} numeric>
                        {count ? `${whole(count.units)} / ${whole(count.sum)}` : "—"}
                        {count && count.revision > 0 ? <span className="ml-1 text-xs text-tremor-content">(revised)</span> : null}
                      </Td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </Table>
        )}
      </Card>

      {canUpload ? <CsvUpload campaignId={campaign.id} metric={campaign.metric.kind} /> : null}
    </div>
  );
}
