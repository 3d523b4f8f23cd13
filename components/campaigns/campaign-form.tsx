"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { Controller, useFieldArray, useForm, useWatch, type Control, type FieldPath } from "react-hook-form";
import type { z } from "zod";
import { createCampaignAction } from "@/app/(workspace)/campaigns/actions";
import { Button, Card, CardHeader, Field, Input, Notice, Select, fieldAria } from "@/components/ui";
import { previewPlan } from "@/lib/campaigns/compute-plan";
import { createCampaignSchema, type CreateCampaignInput } from "@/lib/validation/campaigns";

type FormInput = z.input<typeof createCampaignSchema>;

function today(): string {
  return new Date().toISOString().slice(0, 10);
}

const DEFAULTS: FormInput = {
  name: "",
  hypothesis: "",
  metric: { kind: "conversion", name: "Purchase" },
  baselineRate: 0.04,
  minimumLift: 0.1,
  alpha: 0.05,
  power: 0.8,
  sides: 2,
  arms: [
    { key: "holdout", name: "Holdout", share: 0.1 },
    { key: "treatment", name: "Campaign", share: 0.9 },
  ],
  startDate: today(),
  maxDays: 28,
  dailyUnits: 5000,
};

const toNumber = (value: unknown) => (value === "" || value === null || value === undefined ? undefined : Number(value));

/** A number typed as a percentage, stored as a fraction (10 % ⇄ 0.1). */
function PercentInput({ control, name, id, error }: { control: Control<FormInput>; name: FieldPath<FormInput>; id: string; error?: string }) {
  return (
    <Controller
      control={control}
      name={name}
      render={({ field }) => (
        <div className="flex items-center gap-2">
          <Input
            {...fieldAria(id, error)}
            inputMode="decimal"
            className="text-right tabular-nums"
            defaultValue={typeof field.value === "number" ? String(+(field.value * 100).toPrecision(10)) : ""}
            onChange={(event) => {
              const value = toNumber(event.target.value.replace(",", "."));
              field.onChange(value === undefined ? undefined : value / 100);
            }}
            onBlur={field.onBlur}
          />
          <span className="text-sm text-tremor-content dark:text-dark-tremor-content" aria-hidden="true">
            %
          </span>
        </div>
      )}
    />
  );
}

function errorAt(errors: unknown, path: string): string | undefined {
  let node = errors as Record<string, unknown> | undefined;
  for (const part of path.split(".")) node = node?.[part] as Record<string, unknown> | undefined;
  const message = (node as { message?: string; root?: { message?: string } } | undefined)?.message ?? (node as { root?: { message?: string } } | undefined)?.root?.message;
  return typeof message === "string" ? message : undefined;
}

/** The plan form: typed plan → live fixed-horizon sample size and duration from lib/sequential → server action. */
export function CampaignForm() {
  const router = useRouter();
  const [pending, startTransition] = useTransition();
  const [serverError, setServerError] = useState<string | null>(null);
  const form = useForm<FormInput, unknown, CreateCampaignInput>({ resolver: zodResolver(createCampaignSchema), defaultValues: DEFAULTS, mode: "onTouched" });
  const { register, control, handleSubmit, formState, setError } = form;
  const arms = useFieldArray({ control, name: "arms" });
  const values = useWatch({ control }) as FormInput;
  const kind = values.metric?.kind ?? "conversion";
  const parsed = createCampaignSchema.safeParse(values);
  const preview = parsed.success ? previewPlan(parsed.data, parsed.data.dailyUnits) : null;
  const errors = formState.errors;

  const onSubmit = handleSubmit((input) => {
    setServerError(null);
    startTransition(async () => {
      const result = await createCampaignAction(input);
      if (result.ok) {
        router.push(`/campaigns/${result.data.id}`);
        return;
      }
      setServerError(result.error);
      for (const [path, messages] of Object.entries(result.fieldErrors ?? {})) setError(path as FieldPath<FormInput>, { message: messages[0] });
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
      <div className="space-y-6">
        <Card>
          <CardHeader title="Campaign" description="What is being tested, and on which outcome." />
          <div className="grid gap-4 sm:grid-cols-2">
            <div className="sm:col-span-2">
              <Field id="name" label="Name" error={errorAt(errors, "name")}>
                <Input {...fieldAria("name", errorAt(errors, "name"))} placeholder="Spring trail-shoe e-mail" {...register("name")} />
              </Field>
            </div>
            <div className="sm:col-span-2">
              <Field id="hypothesis" label="Hypothesis" hint="One sentence: who, what change, which outcome." error={errorAt(errors, "hypothesis")}>
                <textarea id="hypothesis" rows={2} className="block w-full rounded-tremor-default border-tremor-border text-sm" {...register("hypothesis")} />
              </Field>
            </div>
            <Field id="metric-kind" label="Metric" error={errorAt(errors, "metric.kind")}>
              <Select {...fieldAria("metric-kind")} {...register("metric.kind")}>
                <option value="conversion">Conversion (share of units that convert)</option>
                <option value="mean">Mean per unit (e.g. order value)</option>
              </Select>
            </Field>
            <Field id="metric-name" label="Metric name" error={errorAt(errors, "metric.name")}>
              <Input {...fieldAria("metric-name", errorAt(errors, "metric.name"))} {...register("metric.name")} />
            </Field>
            {kind === "conversion" ? (
              <Field id="baselineRate" label="Baseline conversion rate" hint="The holdout's expected rate." error={errorAt(errors, "baselineRate")}>
                <PercentInput control={control} name="baselineRate" id="baselineRate" error={errorAt(errors, "baselineRate")} />
              </Field>
            ) : (
              <>
                <Field id="metric-unit" label="Unit" hint="For example USD." error={errorAt(errors, "metric.unit")}>
                  <Input {...fieldAria("metric-unit")} {...register("metric.unit")} />
                </Field>
                <Field id="baselineMean" label="Baseline mean per unit" error={errorAt(errors, "baselineMean")}>
                  <Input {...fieldAria("baselineMean", errorAt(errors, "baselineMean"))} inputMode="decimal" className="text-right" {...register("baselineMean", { setValueAs: toNumber })} />
                </Field>
                <Field id="baselineSd" label="Standard deviation per unit" error={errorAt(errors, "baselineSd")}>
                  <Input {...fieldAria("baselineSd", errorAt(errors, "baselineSd"))} inputMode="decimal" className="text-right" {...register("baselineSd", { setValueAs: toNumber })} />
                </Field>
              </>
            )}
          </div>
        </Card>

        <Card>
          <CardHeader title="Plan" description="Locked once counts arrive." />
          <div className="grid gap-4 sm:grid-cols-2">
            <Field id="minimumLift" label="Minimum lift worth detecting (relative)" hint="10 % means 4.0 % → 4.4 %." error={errorAt(errors, "minimumLift")}>
              <PercentInput control={control} name="minimumLift" id="minimumLift" error={errorAt(errors, "minimumLift")} />
            </Field>
            <Field id="alpha" label="Significance level α" error={errorAt(errors, "alpha")}>
              <PercentInput control={control} name="alpha" id="alpha" error={errorAt(errors, "alpha")} />
            </Field>
            <Field id="power" label="Power" error={errorAt(errors, "power")}>
              <PercentInput control={control} name="power" id="power" error={errorAt(errors, "power")} />
            </Field>
            <Field id="sides" label="Sidedness" error={errorAt(errors, "sides")}>
              <Select {...fieldAria("sides")} {...register("sides", { setValueAs: toNumber })}>
                <option value={2}>Two-sided (lift or harm)</option>
                <option value={1}>One-sided (lift only)</option>
              </Select>
            </Field>
            <Field id="startDate" label="Start date" error={errorAt(errors, "startDate")}>
              <Input type="date" {...fieldAria("startDate", errorAt(errors, "startDate"))} {...register("startDate")} />
            </Field>
            <Field id="maxDays" label="Maximum duration (days)" error={errorAt(errors, "maxDays")}>
              <Input {...fieldAria("maxDays", errorAt(errors, "maxDays"))} inputMode="numeric" className="text-right" {...register("maxDays", { setValueAs: toNumber })} />
            </Field>
            <Field id="dailyUnits" label="Expected units a day (all arms)" error={errorAt(errors, "dailyUnits")}>
              <Input {...fieldAria("dailyUnits", errorAt(errors, "dailyUnits"))} inputMode="numeric" className="text-right" {...register("dailyUnits", { setValueAs: toNumber })} />
            </Field>
          </div>
        </Card>

        <Card>
          <CardHeader title="Arms" description='A holdout (key "holdout") and one or more treatments; a 10 % holdout is a common default.' />
          {errorAt(errors, "arms") ? (
            <p role="alert" className="mb-3 text-sm font-medium text-red-700">
              Error: {errorAt(errors, "arms")}
            </p>
          ) : null}
          <div className="space-y-3">
            {arms.fields.map((arm, index) => (
              <div key={arm.id} className="grid items-end gap-3 sm:grid-cols-[1fr_1fr_8rem_auto]">
                <Field id={`arm-${index}-key`} label="Key" error={errorAt(errors, `arms.${index}.key`)}>
                  <Input {...fieldAria(`arm-${index}-key`, errorAt(errors, `arms.${index}.key`))} {...register(`arms.${index}.key`)} />
                </Field>
                <Field id={`arm-${index}-name`} label="Name" error={errorAt(errors, `arms.${index}.name`)}>
                  <Input {...fieldAria(`arm-${index}-name`, errorAt(errors, `arms.${index}.name`))} {...register(`arms.${index}.name`)} />
                </Field>
                <Field id={`arm-${index}-share`} label="Share" error={errorAt(errors, `arms.${index}.share`)}>
                  <PercentInput control={control} name={`arms.${index}.share`} id={`arm-${index}-share`} error={errorAt(errors, `arms.${index}.share`)} />
                </Field>
                <Button variant="ghost" size="sm" onClick={() => arms.remove(index)} disabled={arms.fields.length <= 2} aria-label={`Remove arm ${index + 1}`}>
                  Remove
                </Button>
              </div>
            ))}
          </div>
          <Button variant="secondary" size="sm" className="mt-4" onClick={() => arms.append({ key: `variant-${arms.fields.length}`, name: `Variant ${arms.fields.length}`, share: 0.1 })}>
            Add a treatment arm
          </Button>
        </Card>
      </div>

      <aside className="space-y-4 lg:sticky lg:top-4 lg:self-start" aria-live="polite">
        <Card>
          <CardHeader title="Fixed-horizon plan" description="Units each arm needs, from the plan as typed." />
          {preview?.ok ? (
            <>
            <dl className="space-y-2 text-sm" data-testid="plan-preview">
              {Object.entries(preview.plan.perArm).map(([key, units]) => (
                <div key={key} className="flex justify-between gap-4">
                  <dt>{key}</dt>
                  <dd className="tabular-nums">{units.toLocaleString("en-US")} units</dd>
                </div>
              ))}
              <div className="flex justify-between gap-4 border-t pt-2 font-medium">
                <dt>Total</dt>
                <dd className="tabular-nums">{preview.plan.total.toLocaleString("en-US")} units</dd>
              </div>
              <div className="flex justify-between gap-4 font-medium">
                <dt>Duration</dt>
                <dd className="tabular-nums" data-testid="plan-days">
                  {preview.plan.days === null ? "—" : `${preview.plan.days} days`}
                </dd>
              </div>
            </dl>
              {preview.plan.days !== null && values.maxDays !== undefined && preview.plan.days > Number(values.maxDays) ? (
                <Notice tone="warning" title="Longer than the maximum duration" className="mt-3">
                  At the expected traffic the plan needs {preview.plan.days} days; the campaign stops at {String(values.maxDays)}.
                </Notice>
              ) : null}
            </>
          ) : (
            <p className="text-sm text-tremor-content dark:text-dark-tremor-content">{preview && !preview.ok ? preview.reason : "Complete the plan to see the sample size."}</p>
          )}
        </Card>
        {serverError ? <Notice tone="error" title={serverError} /> : null}
        <Button type="submit" pending={pending} className="w-full">
          Register campaign
        </Button>
      </aside>
    </form>
  );
}
