"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { controlClasses } from "@/components/ui/input";
import { updateAlertRuleSchema, type UpdateAlertRuleInput } from "@/lib/validation/alert-rules";
import { useAction } from "../../_components/use-action";
import { updateAlertRuleAction } from "../actions";

export interface Choice {
  value: string;
  label: string;
  description: string;
}

function ChoiceGroup({ legend, hint, name, choices, register, error }: { legend: string; hint: string; name: "calls" | "defaultRecipientRoles"; choices: Choice[]; register: ReturnType<typeof useForm<UpdateAlertRuleInput>>["register"]; error?: string }) {
  const hintId = `alert-rules-${name}-hint`;
  const errorId = `alert-rules-${name}-error`;
  return (
    <fieldset className="space-y-2" aria-describedby={error ? errorId : hintId}>
      <legend className="text-sm font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">{legend}</legend>
      <p id={hintId} className="text-xs text-tremor-content dark:text-dark-tremor-content">
        {hint}
      </p>
      <ul className="grid gap-2 sm:grid-cols-2">
        {choices.map((choice) => (
          <li key={choice.value}>
            <label className="flex items-start gap-2 rounded-tremor-default border border-tremor-border p-3 text-sm dark:border-dark-tremor-border">
              <input type="checkbox" value={choice.value} {...register(name)} className="mt-0.5 rounded border-tremor-border text-pine-700 focus:ring-pine-500" />
              <span>
                <span className="block font-medium text-tremor-content-strong dark:text-dark-tremor-content-strong">{choice.label}</span>
                <span className="block text-xs text-tremor-content dark:text-dark-tremor-content">{choice.description}</span>
              </span>
            </label>
          </li>
        ))}
      </ul>
      {error ? (
        <p id={errorId} role="alert" className="text-xs font-medium text-red-700 dark:text-red-300">
          Error: {error}
        </p>
      ) : null}
    </fieldset>
  );
}

/** The alert rules form of admins and leads; the server checks the role again. */
export function AlertRulesForm({ initial, calls, roles }: { initial: UpdateAlertRuleInput; calls: Choice[]; roles: Choice[] }) {
  const action = useAction(updateAlertRuleAction);
  const [saved, setSaved] = useState(false);
  const form = useForm<UpdateAlertRuleInput>({ resolver: zodResolver(updateAlertRuleSchema, undefined, { raw: true }), defaultValues: initial });
  const errors = form.formState.errors;
  const fieldError = (name: keyof UpdateAlertRuleInput) => errors[name]?.message ?? action.fieldErrors[name]?.[0];
  const extraError = fieldError("extraRecipients");

  async function onSubmit(values: UpdateAlertRuleInput) {
    setSaved(false);
    const result = await action.run(values);
    if (result.ok) {
      setSaved(true);
      form.reset({ ...values, calls: result.data.calls, extraRecipients: result.data.extraRecipients.join("\n"), dailyDigest: result.data.dailyDigest });
    }
  }

  return (
    <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-6" aria-label="Alert rules">
      <ChoiceGroup
        legend="Calls that send an alert"
        hint="An e-mail goes out when a campaign's call changes to one of these. Unticked calls still show on the dashboard."
        name="calls"
        choices={calls}
        register={form.register}
        error={fieldError("calls")}
      />
      <ChoiceGroup
        legend="Roles that receive every campaign's alerts"
        hint="Besides these, each campaign's creator and anyone who subscribed get its alerts; anyone can unsubscribe from a campaign."
        name="defaultRecipientRoles"
        choices={roles}
        register={form.register}
        error={fieldError("defaultRecipientRoles")}
      />
      <div className="space-y-1">
        <label htmlFor="alert-rules-extra" className="block text-sm font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">
          Extra addresses
        </label>
        <textarea
          id="alert-rules-extra"
          rows={3}
          placeholder="growth-alerts@northwind-outfitters.example"
          aria-invalid={extraError ? true : undefined}
          aria-describedby={extraError ? "alert-rules-extra-error" : "alert-rules-extra-hint"}
          className={controlClasses}
          {...form.register("extraRecipients")}
        />
        {extraError ? (
          <p id="alert-rules-extra-error" role="alert" className="text-xs font-medium text-red-700 dark:text-red-300">
            Error: {extraError}
          </p>
        ) : (
          <p id="alert-rules-extra-hint" className="text-xs text-tremor-content dark:text-dark-tremor-content">
            One per line or separated by commas, at most 20. They get every alert, without an unsubscribe link.
          </p>
        )}
      </div>
      <label className="flex items-start gap-2 text-sm">
        <input type="checkbox" {...form.register("dailyDigest")} className="mt-0.5 rounded border-tremor-border text-pine-700 focus:ring-pine-500" />
        <span>
          <span className="block font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">Daily digest</span>
          <span className="block text-xs text-tremor-content dark:text-dark-tremor-content">
            Each morning (workspace time), one e-mail to everyone who follows a running campaign, listing every running campaign&apos;s call.
          </span>
        </span>
      </label>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" pending={action.pending}>
          Save alert rules
        </Button>
        {saved ? (
          <span role="status" className="text-sm text-pine-800 dark:text-pine-200">
            Saved.
          </span>
        ) : null}
      </div>
      {action.error ? (
        <Notice tone="error" title="Not saved">
          {action.error}
        </Notice>
      ) : null}
    </form>
  );
}
