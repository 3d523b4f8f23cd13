"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Field, fieldAria } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Notice } from "@/components/ui/notice";
import type { CreatedApiKey } from "@/lib/api-keys";
import { createApiKeySchema } from "@/lib/validation/api-keys";
import type { z } from "zod";
import { createApiKeyAction } from "../actions";
import { useAction } from "./use-action";

type FormValues = z.input<typeof createApiKeySchema>;

function NewKey({ created, onDone }: { created: CreatedApiKey; onDone: () => void }) {
  const [copied, setCopied] = useState<"yes" | "no" | null>(null);
  async function copy() {
    try {
      await navigator.clipboard.writeText(created.key);
      setCopied("yes");
    } catch {
      setCopied("no");
    }
  }
  return (
    <Notice tone="warning" title={`Key "${created.name}" created: copy it now`}>
      <p>You will not see this key again. Store it in your pipeline&apos;s secret store.</p>
      <div className="mt-2 flex flex-wrap items-center gap-2">
        <code data-testid="new-api-key" className="break-all rounded bg-white px-2 py-1 font-mono text-xs text-slate-900 dark:bg-slate-900 dark:text-slate-100">
          {created.key}
        </code>
        <Button size="sm" variant="secondary" onClick={() => void copy()}>
          Copy key
        </Button>
        <Button size="sm" variant="ghost" onClick={onDone}>
          I stored it
        </Button>
      </div>
      <p aria-live="polite" className="mt-1 text-xs">
        {copied === "yes" ? "Copied to the clipboard." : copied === "no" ? "Copying is blocked here: select the key and copy it by hand." : ""}
      </p>
    </Notice>
  );
}

export function CreateApiKeyForm() {
  const action = useAction(createApiKeyAction);
  const [created, setCreated] = useState<CreatedApiKey | null>(null);
  const form = useForm<FormValues>({ resolver: zodResolver(createApiKeySchema), defaultValues: { name: "", permissions: ["ingest"] } });
  const errors = form.formState.errors;
  const nameError = errors.name?.message ?? action.fieldErrors.name?.[0];
  const permissionError = errors.permissions?.message ?? action.fieldErrors.permissions?.[0];

  async function onSubmit(values: FormValues) {
    const result = await action.run(values);
    if (result.ok) {
      setCreated(result.data);
      form.reset({ name: "", permissions: ["ingest"] });
    }
  }

  return (
    <div className="space-y-3">
      {created ? <NewKey created={created} onDone={() => setCreated(null)} /> : null}
      <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-3" aria-label="Create an API key">
        <div className="grid gap-3 sm:grid-cols-[1fr_auto_auto] sm:items-start">
          <Field id="key-name" label="Key name" hint="Where it is used, e.g. warehouse sync." error={nameError}>
            <Input autoComplete="off" {...fieldAria("key-name", nameError, "hint")} {...form.register("name")} />
          </Field>
          <fieldset className="space-y-1" aria-describedby={permissionError ? "key-permissions-error" : undefined}>
            <legend className="text-sm font-medium text-tremor-content-strong dark:text-dark-tremor-content-strong">Permissions</legend>
            <label className="flex items-center gap-2 text-sm">
              <input type="checkbox" value="ingest" className="rounded border-tremor-border text-pine-700" {...form.register("permissions")} />
              Push daily counts (ingest)
            </label>
            <label className="flex items-center gap-2 text-sm">
              <input type="checkbox" value="read" className="rounded border-tremor-border text-pine-700" {...form.register("permissions")} />
              Read campaign results (read)
            </label>
            {permissionError ? (
              <p id="key-permissions-error" role="alert" className="text-xs font-medium text-red-700 dark:text-red-300">
                Error: {permissionError}
              </p>
            ) : null}
          </fieldset>
          <div className="sm:pt-6">
            <Button type="submit" pending={action.pending} className="w-full sm:w-auto">
              Create key
            </Button>
          </div>
        </div>
        {action.error ? <Notice tone="error" title="No key created">{action.error}</Notice> : null}
      </form>
    </div>
  );
}
