"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Field, fieldAria } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { Notice } from "@/components/ui/notice";
import { authClient } from "@/lib/auth/client";
import { createWorkspaceSchema, workspaceSlug, type CreateWorkspaceInput } from "@/lib/validation/workspace";
import { hardNavigate } from "@/components/shell/hard-navigate";

export function CreateWorkspaceForm({ timeZones }: { timeZones: string[] }) {
  const [error, setError] = useState<string | null>(null);
  const form = useForm<CreateWorkspaceInput>({ resolver: zodResolver(createWorkspaceSchema), defaultValues: { name: "", timeZone: "UTC" } });
  const { errors, isSubmitting } = form.formState;

  useEffect(() => {
    const browserZone = Intl.DateTimeFormat().resolvedOptions().timeZone;
    if (browserZone && timeZones.includes(browserZone) && !form.getFieldState("timeZone").isDirty) form.setValue("timeZone", browserZone);
  }, [form, timeZones]);

  async function onSubmit(values: CreateWorkspaceInput) {
    setError(null);
    const created = await authClient.organization.create({
      name: values.name,
      slug: workspaceSlug(values.name, crypto.randomUUID().slice(0, 6)),
      timeZone: values.timeZone,
    } as Parameters<typeof authClient.organization.create>[0]);
    if (created.error || !created.data) {
      setError(created.error?.status === 400 ? "This workspace could not be created: choose another name." : "The workspace could not be created. Try again.");
      return;
    }
    await authClient.organization.setActive({ organizationId: created.data.id });
    hardNavigate("/campaigns");
  }

  return (
    <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-4">
      {error ? <Notice tone="error">{error}</Notice> : null}
      <Field id="workspace-name" label="Workspace name" hint="Usually your company or team, e.g. Northwind Outfitters." error={errors.name?.message}>
        <Input autoComplete="organization" {...fieldAria("workspace-name", errors.name?.message, "hint")} {...form.register("name")} />
      </Field>
      <Field id="workspace-time-zone" label="Time zone" hint="Days of counts and alerts follow this zone." error={errors.timeZone?.message}>
        <Select {...fieldAria("workspace-time-zone", errors.timeZone?.message, "hint")} {...form.register("timeZone")}>
          {timeZones.map((zone) => (
            <option key={zone} value={zone}>
              {zone.replace(/_/g, " ")}
            </option>
          ))}
        </Select>
      </Field>
      <Button type="submit" className="w-full" pending={isSubmitting}>
        Create workspace
      </Button>
    </form>
  );
}
