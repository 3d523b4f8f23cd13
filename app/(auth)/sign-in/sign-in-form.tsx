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
import { signInSchema, type SignInInput } from "../_components/auth-schemas";
import { withNext } from "../_components/safe-next";
import { hardNavigate } from "@/components/shell/hard-navigate";

export function SignInForm({ next }: { next: string }) {
  const [error, setError] = useState<string | null>(null);
  const [unverifiedEmail, setUnverifiedEmail] = useState<string | null>(null);
  const [resent, setResent] = useState(false);
  const form = useForm<SignInInput>({ resolver: zodResolver(signInSchema), defaultValues: { email: "", password: "" } });
  const { errors, isSubmitting } = form.formState;

  async function onSubmit(values: SignInInput) {
    setError(null);
    setUnverifiedEmail(null);
    const result = await authClient.signIn.email({ email: values.email, password: values.password });
    if (result.error) {
      setError(authErrorMessage(result.error));
      if (result.error.code === "EMAIL_NOT_VERIFIED") setUnverifiedEmail(values.email);
      return;
    }
    hardNavigate(next);
  }

  async function resend() {
    if (!unverifiedEmail) return;
    await authClient.sendVerificationEmail({ email: unverifiedEmail, callbackURL: withNext("/verify-email", next) });
    setResent(true);
  }

  return (
    <form onSubmit={form.handleSubmit(onSubmit)} noValidate className="space-y-4">
      {error ? (
        <Notice tone="error" title="Not signed in">
          <p>{error}</p>
          {unverifiedEmail ? (
            resent ? (
              <p className="mt-2">We sent a new confirmation link to {unverifiedEmail}.</p>
            ) : (
              <Button variant="secondary" size="sm" className="mt-2" onClick={() => void resend()}>
                Send the confirmation link again
              </Button>
            )
          ) : null}
        </Notice>
      ) : null}
      <Field id="email" label="E-mail" error={errors.email?.message}>
        <Input type="email" autoComplete="email" {...fieldAria("email", errors.email?.message)} {...form.register("email")} />
      </Field>
      <Field id="password" label="Password" error={errors.password?.message}>
        <Input type="password" autoComplete="current-password" {...fieldAria("password", errors.password?.message)} {...form.register("password")} />
      </Field>
      <Button type="submit" className="w-full" pending={isSubmitting}>
        Sign in
      </Button>
      <div className="flex flex-wrap justify-between gap-2 text-sm">
        <Link href="/forgot-password" className="text-pine-700 underline underline-offset-2 dark:text-pine-300">
          Forgot your password?
        </Link>
        <Link href={withNext("/sign-up", next)} className="text-pine-700 underline underline-offset-2 dark:text-pine-300">
          Create an account
        </Link>
      </div>
    </form>
  );
}
