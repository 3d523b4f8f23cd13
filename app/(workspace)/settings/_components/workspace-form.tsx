"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Field, fieldAria } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { Notice } from "@/components/ui/notice";
import { updateWorkspaceSchema, type UpdateWorkspaceInput } from "@/lib/validation/workspace";
import { updateWorkspaceAction } from "../actions";
import { useAction } from "./use-action";

export function WorkspaceForm({ initial, timeZones }: { initial: UpdateWorkspaceInput; timeZones: string[] }) {
  const action = useAction(updateWorkspaceAction);
  const [saved, setSaved] = useState(false);
  const form = useForm<UpdateWorkspaceInput>({ resolver: zodResolver(updateWorkspaceSchema), defaultValues: initial });
  const errors = form.formState.errors;
  const nameError = errors.name?.message ?? action.fieldErrors.name?.[0];
  const zoneError = errors.timeZone?.message ?? action.fieldErrors.timeZone?.[0];

  async function onSubmit(values: UpdateWorkspaceInput) {
    setSaved(false);
    const result = await action.run(values);
    if (result.ok) {
      setSaved(true);
      form.reset(result.data);
    }
  }

  return (
    <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-3" aria-label="Workspace settings">
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id="settings-workspace-name" label="Workspace name" error={nameError}>
          <Input {...fieldAria("settings-workspace-name", nameError)} {...form.register("name")} />
        </Field>
        <Field id="settings-time-zone" label="Time zone" hint="Days of counts and alerts follow this zone." error={zoneError}>
          <Select {...fieldAria("settings-time-zone", zoneError, "hint")} {...form.register("timeZone")}>
            {timeZones.map((zone) => (
              <option key={zone} value={zone}>
                {zone.replace(/_/g, " ")}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" pending={action.pending}>
          Save workspace
        </Button>
        {saved ? <span role="status" className="text-sm text-pine-800 dark:text-pine-200">Saved.</span> : null}
      </div>
      {action.error ? <Notice tone="error" title="Not saved">{action.error}</Notice> : null}
    </form>
  );
}
