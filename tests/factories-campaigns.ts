import { randomUUID } from "node:crypto";
import { inject } from "vitest";
import { getPool } from "@/db";
import type { CampaignDto } from "@/db/queries/campaigns";
import type { TestUser, TestWorkspace } from "./factories";

/** A day `offset` days from today (UTC), `YYYY-MM-DD`. */
export function dayFromToday(offset: number): string {
  const date = new Date();
  date.setUTCDate(date.getUTCDate() + offset);
  return date.toISOString().slice(0, 10);
}

/** A valid `POST /api/v1/campaigns` body for Northwind Outfitters: conversion metric, 10 % holdout, started 20 days ago. */
export function campaignBody(overrides: Record<string, unknown> = {}): Record<string, unknown> {
  return {
    name: `Trail shoe spring e-mail ${randomUUID().slice(0, 6)}`,
    hypothesis: "The spring trail-shoe e-mail lifts first purchases among newsletter subscribers.",
    metric: { kind: "conversion", name: "First purchase" },
    baselineRate: 0.05,
    minimumLift: 0.1,
    alpha: 0.05,
    power: 0.8,
    sides: 2,
    arms: [
      { key: "holdout", name: "Holdout", share: 0.1 },
      { key: "treatment", name: "Spring e-mail", share: 0.9 },
    ],
    startDate: dayFromToday(-20),
    maxDays: 28,
    dailyUnits: 20_000,
    ...overrides,
  };
}

/** A mean-metric body (order value per recipient, in USD). */
export function meanCampaignBody(overrides: Record<string, unknown> = {}): Record<string, unknown> {
  const { baselineRate: _unused, ...body } = campaignBody({
    name: `Tent promo order value ${randomUUID().slice(0, 6)}`,
    metric: { kind: "mean", name: "Order value per recipient", unit: "USD" },
    baselineMean: 4.2,
    baselineSd: 18,
    minimumLift: 0.05,
    ...overrides,
  });
  void _unused;
  return body;
}

/** Registers a campaign through the API as the workspace's marketer (or `as`). */
export async function createCampaign(workspace: TestWorkspace, overrides: Record<string, unknown> = {}, as: TestUser = workspace.marketer): Promise<CampaignDto> {
  const response = await as.client.json<CampaignDto>("/api/v1/campaigns", { method: "POST", json: campaignBody(overrides) });
  if (response.status !== 201) throw new Error(`campaign creation failed: ${response.status} ${JSON.stringify(response.body)}`);
  return response.body;
}

/** A conversion row for the ingest API. */
export function countRow(campaign: string, arm: string, date: string, units: number, conversions: number) {
  return { campaign, arm, date, units, conversions };
}

/** Pushes counts through `POST /api/v1/ingest` with a pipeline key; a fresh idempotency key unless given. */
export async function pushCounts(
  key: string,
  rows: unknown[],
  options: { idempotencyKey?: string; body?: unknown } = {},
): Promise<{ status: number; body: Record<string, unknown>; response: Response }> {
  const response = await fetch(new URL("/api/v1/ingest", inject("appUrl")), {
    method: "POST",
    headers: { authorization: `Bearer ${key}`, "content-type": "application/json", "idempotency-key": options.idempotencyKey ?? randomUUID() },
    body: JSON.stringify(options.body ?? { rows }),
  });
  const text = await response.text();
  return { status: response.status, body: text ? JSON.parse(text) : null, response };
}

/** Tables the product writes (the auth tables change on every key check and are left out). */
export const PRODUCT_TABLES = [
  "campaigns",
  "arms",
  "daily_counts",
  "daily_count_revisions",
  "ingest_batches",
  "analysis_days",
  "alerts",
  "alert_deliveries",
  "subscriptions",
  "alert_rules",
  "decisions",
  "audit_events",
] as const;

/**
 * Every row of every product table, as text in a stable order: compare two dumps to prove nothing was
 * written. With `workspaceIds`, only rows of those workspaces (by workspace_id, or campaign_id of their
 * campaigns), so test files running side by side do not disturb each other.
 */
export async function dumpProductTables(workspaceIds?: string[]): Promise<string> {
  const pool = getPool();
  const parts: string[] = [];
  for (const table of PRODUCT_TABLES) {
    const { rows: columns } = await pool.query<{ column_name: string }>("select column_name from information_schema.columns where table_name = $1", [table]);
    if (columns.length === 0) continue;
    const names = new Set(columns.map((column) => column.column_name));
    let where = "";
    const params: unknown[] = [];
    if (workspaceIds) {
      params.push(workspaceIds);
      if (names.has("workspace_id")) where = "where t.workspace_id = any($1)";
      else if (names.has("campaign_id")) where = "where t.campaign_id in (select id from campaigns where workspace_id = any($1))";
      else if (names.has("alert_id")) where = "where t.alert_id in (select a.id from alerts a join campaigns c on c.id = a.campaign_id where c.workspace_id = any($1))";
      else if (names.has("user_id")) where = "where t.user_id in (select user_id from members where organization_id = any($1))";
      else params.pop();
    }
    const { rows } = await pool.query(`select row_to_json(t)::text as line from ${table} t ${where} order by 1`, params);
    parts.push(`-- ${table}\n${rows.map((row) => row.line).join("\n")}`);
  }
  return parts.join("\n");
}
