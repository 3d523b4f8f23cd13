"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Field, fieldAria } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Notice } from "@/components/ui/notice";
import { authClient } from "@/lib/auth/client";
import { authErrorMessage } from "../_components/auth-errors";
import { MIN_PASSWORD_LENGTH, resetPasswordSchema, type ResetPasswordInput } from "../_components/auth-schemas";

export function ResetPasswordForm({ token }: { token: string }) {
  const [done, setDone] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const form = useForm<ResetPasswordInput>({ resolver: zodResolver(resetPasswordSchema), defaultValues: { password: "", confirm: "" } });
  const { errors, isSubmitting } = form.formState;

  async function onSubmit(values: ResetPasswordInput) {
    setError(null);
    const result = await authClient.resetPassword({ newPassword: values.password, token });
    if (result.error) {
      setError(authErrorMessage(result.error));
      return;
    }
    setDone(true);
  }

  if (done) {
    return (
      <Notice tone="success" title="Password changed">
        <p>
          Your new password is set.{" "}
          <Link href="/sign-in" className="underline underline-offset-2">
            Sign in
          </Link>{" "}
          with it.
        </p>
      </Notice>
    );
  }

  return (
    <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-4">
      {error ? <Notice tone="error" title="Password not changed">{error}</Notice> : null}
      <Field id="password" label="New password" hint={`At least ${MIN_PASSWORD_LENGTH} characters.`} error={errors.password?.message}>
        <Input type="password" autoComplete="new-password" {...fieldAria("password", errors.password?.message, "hint")} {...form.register("password")} />
      </Field>
      <Field id="confirm" label="New password again" error={errors.confirm?.message}>
        <Input type="password" autoComplete="new-password" {...fieldAria("confirm", errors.confirm?.message)} {...form.register("confirm")} />
      </Field>
      <Button type="submit" className="w-full" pending={isSubmitting}>
        Set the new password
      </Button>
    </form>
  );
}
