"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Field, fieldAria } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { Notice } from "@/components/ui/notice";
import { ROLE_NAMES } from "@/lib/auth/permissions";
import { ROLE_DESCRIPTIONS, inviteMemberSchema, type InviteMemberInput } from "@/lib/validation/members";
import { inviteMemberAction } from "../actions";
import { useAction } from "./use-action";

export function InviteMemberForm() {
  const action = useAction(inviteMemberAction);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const form = useForm<InviteMemberInput>({ resolver: zodResolver(inviteMemberSchema), defaultValues: { email: "", role: "viewer" } });
  const errors = form.formState.errors;
  const emailError = errors.email?.message ?? action.fieldErrors.email?.[0];
  const roleError = errors.role?.message ?? action.fieldErrors.role?.[0];

  async function onSubmit(values: InviteMemberInput) {
    setSentTo(null);
    const result = await action.run(values);
    if (result.ok) {
      setSentTo(result.data.email);
      form.reset({ email: "", role: values.role });
    }
  }

  return (
    <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-3" aria-label="Invite a member">
      <div className="grid gap-3 sm:grid-cols-[1fr_14rem_auto] sm:items-start">
        <Field id="invite-email" label="E-mail address" error={emailError}>
          <Input type="email" autoComplete="off" placeholder="name@northwind.example" {...fieldAria("invite-email", emailError)} {...form.register("email")} />
        </Field>
        <Field id="invite-role" label="Role" error={roleError}>
          <Select {...fieldAria("invite-role", roleError)} {...form.register("role")}>
            {ROLE_NAMES.map((role) => (
              <option key={role} value={role}>
                {ROLE_DESCRIPTIONS[role].split(":")[0]}
              </option>
            ))}
          </Select>
        </Field>
        <div className="sm:pt-6">
          <Button type="submit" pending={action.pending} className="w-full sm:w-auto">
            Send invitation
          </Button>
        </div>
      </div>
      {action.error ? <Notice tone="error" title="Invitation not sent">{action.error}</Notice> : null}
      {sentTo ? <Notice tone="success" title="Invitation sent">We e-mailed an invitation to {sentTo}. It expires in 7 days.</Notice> : null}
    </form>
  );
}
