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
import { MIN_PASSWORD_LENGTH, signUpSchema, type SignUpInput } from "../_components/auth-schemas";
import { withNext } from "../_components/safe-next";

export function SignUpForm({ next, email: presetEmail }: { next: string; email?: string }) {
  const [error, setError] = useState<string | null>(null);
  const [sentTo, setSentTo] = useState<string | null>(null);
  const form = useForm<SignUpInput>({
    resolver: zodResolver(signUpSchema),
    defaultValues: { name: "", email: presetEmail ?? "", password: "" },
  });
  const { errors, isSubmitting } = form.formState;

  async function onSubmit(values: SignUpInput) {
    setError(null);
    const result = await authClient.signUp.email({
      name: values.name,
      email: values.email,
      password: values.password,
      callbackURL: withNext("/verify-email", next),
    });
    if (result.error) {
      setError(authErrorMessage(result.error));
      return;
    }
    setSentTo(values.email);
  }

  if (sentTo) {
    return (
      <div className="space-y-4" data-testid="check-mailbox">
        <Notice tone="success" title="Check your mailbox">
          <p>
            We sent a confirmation link to <strong className="break-all">{sentTo}</strong>. Open it to finish creating your account; it signs you in.
          </p>
        </Notice>
        <p className="text-sm text-tremor-content dark:text-dark-tremor-content">
          Nothing arrived after a few minutes? Look in the spam folder, or{" "}
          <Link href={withNext("/verify-email", next)} className="text-pine-700 underline underline-offset-2 dark:text-pine-300">
            ask for a new link
          </Link>
          .
        </p>
      </div>
    );
  }

  return (
    <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-4">
      {error ? <Notice tone="error" title="No account created">{error}</Notice> : null}
      <Field id="name" label="Name" error={errors.name?.message}>
        <Input autoComplete="name" {...fieldAria("name", errors.name?.message)} {...form.register("name")} />
      </Field>
      <Field id="email" label="E-mail" error={errors.email?.message}>
        <Input type="email" autoComplete="email" {...fieldAria("email", errors.email?.message)} {...form.register("email")} />
      </Field>
      <Field id="password" label="Password" hint={`At least ${MIN_PASSWORD_LENGTH} characters.`} error={errors.password?.message}>
        <Input
          type="password"
          autoComplete="new-password"
          {...fieldAria("password", errors.password?.message, "hint")}
          {...form.register("password")}
        />
      </Field>
      <Button type="submit" className="w-full" pending={isSubmitting}>
        Create account
      </Button>
      <p className="text-sm text-tremor-content dark:text-dark-tremor-content">
        Have an account?{" "}
        <Link href={withNext("/sign-in", next)} className="text-pine-700 underline underline-offset-2 dark:text-pine-300">
          Sign in
        </Link>
      </p>
    </form>
  );
}
