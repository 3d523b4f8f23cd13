"use client";

import { DataTable } from "@/components/dashboard/data-table";
import { useEffect, useState } from "react";
import useSWR from "swr";
import { Card, CardHeader, Notice, Select, Td, Th, controlClasses } from "@/components/ui";
import type { PlannerResult } from "@/lib/planner/plan-design";
import { DownloadCsvButton } from "./download-csv-button";
import { formatCount, formatLiftPercent, formatPercent } from "./format";

interface Fields {
  metric: "conversion" | "mean";
  baseline: string;
  standardDeviation: string;
  minimumLift: string;
  alpha: string;
  power: string;
  sides: string;
  holdoutShare: string;
  dailyUnits: string;
}

const START: Fields = { metric: "conversion", baseline: "4", standardDeviation: "24", minimumLift: "10", alpha: "0.05", power: "0.8", sides: "2", holdoutShare: "10", dailyUnits: "20000" };

function query(fields: Fields): string {
  const conversion = fields.metric === "conversion";
  const params = new URLSearchParams({
    metric: fields.metric,
    baseline: conversion ? String(Number(fields.baseline) / 100) : fields.baseline,
    minimumLift: String(Number(fields.minimumLift) / 100),
    alpha: fields.alpha,
    power: fields.power,
    sides: fields.sides,
    holdoutShare: String(Number(fields.holdoutShare) / 100),
    dailyUnits: fields.dailyUnits,
  });
  if (!conversion) params.set("standardDeviation", fields.standardDeviation);
  return `/api/v1/planner?${params}`;
}

async function fetchPlan(url: string): Promise<PlannerResult> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  const body = await response.json().catch(() => ({}));
  if (!response.ok) {
    const errors = (body as { errors?: { pointer?: string; message: string }[] }).errors ?? [];
    throw new Error(errors.map((error) => `${(error.pointer ?? "").replace(/^\//, "")}: ${error.message}`).join("; ") || `The plan cannot be computed (${response.status}).`);
  }
  return body as PlannerResult;
}

function Field({ id, label, hint, children }: { id: string; label: string; hint?: string; children: React.ReactNode }) {
  return (
    <div className="text-sm">
      <label htmlFor={id} className="mb-1 block font-medium">
        {label}
      </label>
      {children}
      {hint ? <p className="mt-1 text-xs text-tremor-content dark:text-dark-tremor-content">{hint}</p> : null}
    </div>
  );
}

/** The planner: a plan's fields, its fixed-horizon size and the always-valid design's expected days (computed on the server). */
export function PlannerForm() {
  const [fields, setFields] = useState<Fields>(START);
  const [key, setKey] = useState(() => query(START));
  useEffect(() => {
    const timer = setTimeout(() => setKey(query(fields)), 400);
    return () => clearTimeout(timer);
  }, [fields]);
  const { data, error, isLoading } = useSWR(key, fetchPlan, { keepPreviousData: true, revalidateOnFocus: false });
  const set = (name: keyof Fields) => (event: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setFields((current) => ({ ...current, [name]: event.target.value }));
  const conversion = fields.metric === "conversion";
  const number = (name: keyof Fields, step: string) => ({ id: `planner-${name}`, name, type: "number", inputMode: "decimal" as const, step, value: fields[name], onChange: set(name), className: controlClasses });

  return (
    <div className="grid gap-6 lg:grid-cols-[22rem_1fr]">
      <Card aria-labelledby="planner-plan">
        <CardHeader id="planner-plan" title="Plan" />
        <form className="space-y-3" onSubmit={(event) => event.preventDefault()}>
          <Field id="planner-metric" label="Metric">
            <Select id="planner-metric" value={fields.metric} onChange={set("metric")}>
              <option value="conversion">Conversion rate</option>
              <option value="mean">Mean per unit (e.g. revenue)</option>
            </Select>
          </Field>
          <Field id="planner-baseline" label={conversion ? "Baseline conversion (%)" : "Baseline mean per unit"}>
            <input {...number("baseline", "any")} />
          </Field>
          {conversion ? null : (
            <Field id="planner-standardDeviation" label="Standard deviation per unit">
              <input {...number("standardDeviation", "any")} />
            </Field>
          )}
          <Field id="planner-minimumLift" label="Minimum lift worth detecting (% relative)">
            <input {...number("minimumLift", "any")} />
          </Field>
          <div className="grid grid-cols-2 gap-3">
            <Field id="planner-alpha" label="Significance level α">
              <input {...number("alpha", "0.01")} />
            </Field>
            <Field id="planner-power" label="Power">
              <input {...number("power", "0.05")} />
            </Field>
          </div>
          <div className="grid grid-cols-2 gap-3">
            <Field id="planner-holdoutShare" label="Holdout share (%)">
              <input {...number("holdoutShare", "1")} />
            </Field>
            <Field id="planner-sides" label="Sides">
              <Select id="planner-sides" value={fields.sides} onChange={set("sides")}>
                <option value="2">Two-sided</option>
                <option value="1">One-sided</option>
              </Select>
            </Field>
          </div>
          <Field id="planner-dailyUnits" label="Units entering per day (both arms)">
            <input {...number("dailyUnits", "1")} />
          </Field>
        </form>
      </Card>
      <div className="space-y-6" aria-live="polite" aria-busy={isLoading}>
        {error ? (
          <Notice tone="error" title="The plan cannot be computed">
            {error instanceof Error ? error.message : "Check the fields."}
          </Notice>
        ) : null}
        {!data ? (
          <Card>
            <p className="text-sm">{isLoading ? "Computing the plan…" : "Fill in the plan."}</p>
          </Card>
        ) : (
          <>
            <Card aria-labelledby="planner-fixed">
              <CardHeader id="planner-fixed" title="Fixed horizon" description="Read the classic test once, on the planned last day." />
              <dl className="grid grid-cols-2 gap-4 text-sm sm:grid-cols-4" data-testid="planner-fixed">
                <div>
                  <dt className="text-tremor-content dark:text-dark-tremor-content">Holdout units</dt>
                  <dd className="text-lg font-semibold tabular-nums">{formatCount(data.fixed.perArm.holdout)}</dd>
                </div>
                <div>
                  <dt className="text-tremor-content dark:text-dark-tremor-content">Treatment units</dt>
                  <dd className="text-lg font-semibold tabular-nums">{formatCount(data.fixed.perArm.treatment)}</dd>
                </div>
                <div>
                  <dt className="text-tremor-content dark:text-dark-tremor-content">Total units</dt>
                  <dd className="text-lg font-semibold tabular-nums">{formatCount(data.fixed.total)}</dd>
                </div>
                <div>
                  <dt className="text-tremor-content dark:text-dark-tremor-content">Days</dt>
                  <dd className="text-lg font-semibold tabular-nums">{data.fixed.days} d</dd>
                </div>
              </dl>
            </Card>
            <Card aria-labelledby="planner-sequential">
              <CardHeader
                id="planner-sequential"
                title="Always-valid design: expected days to a call"
                description={data.method}
                actions={
                  <DownloadCsvButton
                    label="Download CSV"
                    fileParts={["planner"]}
                    header={["true_lift_multiple_of_mde", "true_relative_lift", "expected_days", "median_days", "called_share", "lift_calls", "harm_calls", "flat_calls", "fixed_horizon_days"]}
                    rows={data.scenarios.map((scenario) => [scenario.multiple, scenario.trueLift, scenario.expectedDays, scenario.medianDays, scenario.calledShare, scenario.calls.lift, scenario.calls.harm, scenario.calls.flat, data.fixed.days])}
                  />
                }
              />
              <DataTable caption="Expected days to a call by true lift">
                <thead>
                  <tr>
                    <Th>True lift</Th>
                    <Th numeric>Expected days</Th>
                    <Th numeric>Median days</Th>
                    <Th numeric>Runs with a call by day {data.capDays}</Th>
                    <Th>Calls made</Th>
                    <Th numeric>Fixed horizon</Th>
                  </tr>
                </thead>
                <tbody>
                  {data.scenarios.map((scenario) => (
                    <tr key={scenario.multiple}>
                      <Td>
                        {scenario.multiple === 0 ? "Zero" : scenario.multiple === 1 ? "The MDE" : `${scenario.multiple} × MDE`} ({formatLiftPercent(scenario.trueLift)})
                      </Td>
                      <Td numeric>{scenario.expectedDays.toFixed(1)} d</Td>
                      <Td numeric>{scenario.medianDays} d</Td>
                      <Td numeric>{formatPercent(scenario.calledShare, 0)}</Td>
                      <Td className="text-xs">
                        {scenario.calls.lift} lift proven · {scenario.calls.flat} not worth waiting · {scenario.calls.harm} harm proven
                      </Td>
                      <Td numeric>{data.fixed.days} d</Td>
                    </tr>
                  ))}
                </tbody>
              </DataTable>
              <p className="mt-3 text-xs text-tremor-content dark:text-dark-tremor-content">
                τ = {data.tau.toPrecision(3)} (tuned to be tightest at the fixed horizon). The fixed horizon needs its full {data.fixed.days} days whatever the true lift;
                the always-valid design may be read every day and stops as soon as the evidence suffices.
              </p>
            </Card>
          </>
        )}
      </div>
    </div>
  );
}
