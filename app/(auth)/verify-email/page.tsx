import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { CenteredCard } from "@/components/shell/centered-layout";
import { Notice } from "@/components/ui/notice";
import { getSession } from "@/lib/auth/session";
import { authCodeMessage } from "../_components/auth-errors";
import { EmailLinkForm } from "../_components/email-link-form";
import { safeNext, withNext } from "../_components/safe-next";

export const metadata: Metadata = { title: "Confirm your e-mail" };

// better-auth's confirmation link lands here: with ?error=<code> when the link failed, else signed in.
export default async function VerifyEmailPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const next = safeNext(params.next);
  const error = typeof params.error === "string" ? params.error : null;
  const session = await getSession();
  if (!error && session?.user.emailVerified) redirect(next);

  return (
    <CenteredCard title={error ? "This link did not work" : "Confirm your e-mail address"}>
      <div className="space-y-5">
        {error ? (
          <Notice tone="error" title="E-mail not confirmed">
            {authCodeMessage(error)}
          </Notice>
        ) : (
          <p className="text-sm text-tremor-content dark:text-dark-tremor-content">
            Open the link in the message we sent you. Need a new one? Enter your address.
          </p>
        )}
        <EmailLinkForm purpose="verify" callbackURL={withNext("/verify-email", next)} />
        <p className="text-sm">
          <Link href={withNext("/sign-in", next)} className="text-pine-700 underline underline-offset-2 dark:text-pine-300">
            Back to sign in
          </Link>
        </p>
      </div>
    </CenteredCard>
  );
}
