import type { Metadata } from "next";
import Link from "next/link";
import { CenteredCard } from "@/components/shell/centered-layout";
import { Notice } from "@/components/ui/notice";
import { authCodeMessage } from "../_components/auth-errors";
import { ResetPasswordForm } from "./reset-password-form";

export const metadata: Metadata = { title: "Choose a new password" };

export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { token, error } = await searchParams;
  const usable = typeof token === "string" && /^[A-Za-z0-9_-]{8,200}$/.test(token) && !error;
  return (
    <CenteredCard title="Choose a new password">
      {usable ? (
        <ResetPasswordForm token={token} />
      ) : (
        <div className="space-y-4">
          <Notice tone="error" title="This reset link did not work">
            {authCodeMessage(typeof error === "string" ? error : "INVALID_TOKEN")}
          </Notice>
          <Link href="/forgot-password" className="text-sm text-pine-700 underline underline-offset-2 dark:text-pine-300">
            Ask for a new reset link
          </Link>
        </div>
      )}
    </CenteredCard>
  );
}
