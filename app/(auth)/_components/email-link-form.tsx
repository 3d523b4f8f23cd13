"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Field, fieldAria } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Notice } from "@/components/ui/notice";
import { authClient } from "@/lib/auth/client";
import { authErrorMessage } from "./auth-errors";
import { emailOnlySchema, type EmailOnlyInput } from "./auth-schemas";

/**
 * Asks for an e-mail address and sends a link to it: a new confirmation link or a password-reset link.
 * The answer never says whether an account exists.
 */
export function EmailLinkForm({ purpose, callbackURL }: { purpose: "verify" | "reset"; callbackURL: string }) {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const form = useForm<EmailOnlyInput>({ resolver: zodResolver(emailOnlySchema), defaultValues: { email: "" } });
  const { errors, isSubmitting } = form.formState;

  async function onSubmit(values: EmailOnlyInput) {
    setError(null);
    const result =
      purpose === "verify"
        ? await authClient.sendVerificationEmail({ email: values.email, callbackURL })
        : await authClient.requestPasswordReset({ email: values.email, redirectTo: callbackURL });
    if (result.error) {
      setError(authErrorMessage(result.error));
      return;
    }
    setSentTo(values.email);
  }

  if (sentTo) {
    return (
      <Notice tone="success" title="Check your mailbox">
        If an account uses {sentTo}, a {purpose === "verify" ? "confirmation" : "password-reset"} link is on its way. It works once.
      </Notice>
    );
  }

  return (
    <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-4">
      {error ? <Notice tone="error">{error}</Notice> : null}
      <Field id="link-email" label="E-mail" error={errors.email?.message}>
        <Input type="email" autoComplete="email" {...fieldAria("link-email", errors.email?.message)} {...form.register("email")} />
      </Field>
      <Button type="submit" className="w-full" pending={isSubmitting}>
        {purpose === "verify" ? "Send a new confirmation link" : "Send a reset link"}
      </Button>
    </form>
  );
}
