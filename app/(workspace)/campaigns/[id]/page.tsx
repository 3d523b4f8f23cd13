import { DataTable } from "@/components/dashboard/data-table";
import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { connection } from "next/server";
import { SWRConfig } from "swr";
import { CsvUpload } from "@/components/campaigns/csv-upload";
import { LifecycleButtons } from "@/components/campaigns/lifecycle-buttons";
import { RefreshAndSubscribe } from "@/components/campaigns/refresh-and-subscribe";
import type { CountsDay } from "@/components/charts/counts-chart";
import type { PeekingLook } from "@/components/charts/peeking-cost-chart";
import { CampaignDashboard } from "@/components/dashboard/campaign-dashboard";
import { DecisionPanel } from "@/components/decisions/decision-panel";
import { Badge, Card, CardHeader, EmptyState, Notice, Td, Th } from "@/components/ui";
import { getStoredAnalysis, listAnalysisDays } from "@/db/queries/analysis";
import { getCampaign } from "@/db/queries/campaigns";
import { listDailyCounts } from "@/db/queries/daily-counts";
import { listAlertHistory, listDecisions } from "@/db/queries/decisions";
import { roleAllows } from "@/lib/auth/permissions";
import { requirePageRole } from "@/lib/auth/session";
import { seriesFromStored, statusFromStored } from "@/lib/campaigns/campaign-status";
import { LIFECYCLE_MOVES, STATUS_LABELS } from "@/lib/campaigns/lifecycle";
import { HEALTH_DEFAULTS } from "@/lib/sequential";
import { campaignSeriesKey, campaignStatusKey } from "@/lib/hooks/campaign-keys";
import { MAX_CSV_BYTES, MAX_INGEST_ROWS } from "@/lib/validation/ingest";

export const metadata: Metadata = { title: "Campaign · Peeksafe" };

const percent = (value: number, digits = 1) => `${(value * 100).toFixed(digits)} %`;
const whole = (value: number) => value.toLocaleString("en-US");

export default async function CampaignPage({ params }: { params: Promise<{ id: string }> }) {
  await connection();
  const { membership } = await requirePageRole({ campaign: ["read"] });
  const { id } = await params;
  const campaign = await getCampaign(membership.workspaceId, decodeURIComponent(id));
  if (!campaign) notFound();
  const [counts, stored, analysisDays, decisions, alerts] = await Promise.all([
    listDailyCounts(campaign.id),
    getStoredAnalysis(campaign.id),
    listAnalysisDays(campaign.id),
    listDecisions(membership.workspaceId, campaign.id),
    listAlertHistory(membership.workspaceId, campaign.id),
  ]);
  const status = statusFromStored(campaign, stored);
  const series = seriesFromStored(campaign, stored);
  const canDecide = roleAllows(membership.role, { decision: ["record"] });
  const canRecompute = roleAllows(membership.role, { campaign: ["recompute"] });
  const canUpload = roleAllows(membership.role, { campaign: ["upload"] }) && campaign.status !== "archived";
  const canMove = roleAllows(membership.role, { campaign: ["lifecycle"] });
  const unit = campaign.metric.unit ? ` ${campaign.metric.unit}` : "";
  const running = new Map<string, { units: number; sum: number }>();
  const countsByDay = new Map<string, CountsDay>();
  for (const count of counts) {
    const total = running.get(count.arm) ?? { units: 0, sum: 0 };
    total.units += count.units;
    total.sum += count.sum;
    running.set(count.arm, total);
    const day = countsByDay.get(count.day) ?? { date: count.day, arms: {} };
    day.arms[count.arm] = { units: count.units, sum: count.sum, cumulativeUnits: total.units, cumulativeSum: total.sum, revised: count.revision > 0 };
    countsByDay.set(count.day, day);
  }
  const firstCallAt = alerts.filter((alert) => alert.kind !== "collecting").map((alert) => alert.createdAt).sort()[0] ?? null;
  const revisedDays = counts
    .filter((count) => count.revision > 0)
    .map((count) => ({ date: count.day, arm: count.arm, revisedAfterCall: firstCallAt !== null && count.updatedAt.toISOString() > firstCallAt }));
  const peekingLooks: PeekingLook[] = analysisDays
    .filter((day) => day.peekingCost !== null)
    .map((day) => ({ date: day.day, daysRun: day.daysRun, cost: day.peekingCost! }))
    .filter((look, index, all) => index === 0 || look.cost !== all[index - 1].cost || index === all.length - 1);
  const latest = analysisDays.at(-1);
  const baseline = campaign.metric.kind === "conversion" ? campaign.baselineRate : campaign.baselineMean;

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-start justify-between gap-4">
        <div>
          <h1 className="text-xl font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">{campaign.name}</h1>
          <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-tremor-content dark:text-dark-tremor-content">
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
          <DataTable caption="Planned units per arm" className="min-w-0">
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
          </DataTable>
        </div>
      </Card>

      {/* The first status and series come with the page: the charts draw without a client fetch; SWR polls on from there. */}
      <SWRConfig value={{ fallback: { [campaignStatusKey(campaign.id)]: status, [campaignSeriesKey(campaign.id)]: { id: campaign.id, name: campaign.name, days: series.days } } }}>
        <CampaignDashboard
          campaign={{
            id: campaign.id,
            name: campaign.name,
            alpha: campaign.alpha,
            metricKind: campaign.metric.kind,
            metricUnit: campaign.metric.unit,
            maxDays: campaign.maxDays,
            minimumLiftAbsolute: baseline === null ? null : Math.abs(baseline) * campaign.minimumLift,
            arms: campaign.arms.map((arm) => ({ key: arm.key, name: arm.name, isHoldout: arm.isHoldout })),
          }}
          initialStatus={status}
          initialSeries={series.days}
          peekingLooks={peekingLooks}
          counts={[...countsByDay.values()]}
          health={{
            srmMismatch: latest?.srmSequentialP !== null && latest?.srmSequentialP !== undefined && latest.srmSequentialP < HEALTH_DEFAULTS.srmSignificanceLevel,
            srmGate: HEALTH_DEFAULTS.srmSignificanceLevel,
            srmChiSquareP: latest?.srmP ?? null,
            srmSequentialP: latest?.srmSequentialP ?? null,
            revisedDays,
            planChangedAt: campaign.planChangedAt,
            analyzedAt: latest ? latest.computedAt.toISOString() : null,
          }}
        />
      </SWRConfig>

      <Card aria-labelledby="counts-title">
        <CardHeader id="counts-title" title="Daily counts" description="Each day's new units and outcomes per arm, newest first; a resent day is marked revised." />
        {countsByDay.size === 0 ? (
          <EmptyState title="No counts yet" description="The pipeline pushes them through the ingest API, or upload a CSV below." />
        ) : (
          <DataTable caption="Daily counts per arm">
            <thead>
              <tr>
                <Th>Day</Th>
                {campaign.arms.map((arm) => (
                  <Th key={arm.key} numeric>
                    {arm.name}: units / {campaign.metric.kind === "conversion" ? "conversions" : `sum${unit}`}
                  </Th>
                ))}
              </tr>
            </thead>
            <tbody>
              {[...countsByDay.values()].reverse().map((day) => (
                <tr key={day.date}>
                  <Td>{day.date}</Td>
                  {campaign.arms.map((arm) => {
                    const count = day.arms[arm.key];
                    return (
                      <Td key={arm.key} numeric>
                        {count ? `${whole(count.units)} / ${whole(count.sum)}` : "—"}
                        {count?.revised ? <span className="ml-1 text-xs text-tremor-content dark:text-dark-tremor-content">(revised)</span> : null}
                      </Td>
                    );
                  })}
                </tr>
              ))}
            </tbody>
          </DataTable>
        )}
      </Card>

      <div className="grid gap-6 lg:grid-cols-2">
        <DecisionPanel campaignId={campaign.id} canDecide={canDecide} initial={{ campaignId: campaign.id, status: campaign.status, decisions, alerts }} />
        <RefreshAndSubscribe campaignId={campaign.id} canRecompute={canRecompute} />
      </div>

      {canUpload ? <CsvUpload campaignId={campaign.id} metric={campaign.metric.kind} limits={{ maxBytes: MAX_CSV_BYTES, maxRows: MAX_INGEST_ROWS }} /> : null}
    </div>
  );
}
