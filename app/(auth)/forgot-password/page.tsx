import type { Metadata } from "next";
import Link from "next/link";
import { CenteredCard } from "@/components/shell/centered-layout";
import { EmailLinkForm } from "../_components/email-link-form";

export const metadata: Metadata = { title: "Forgot your password" };

export default function ForgotPasswordPage() {
  return (
    <CenteredCard title="Forgot your password?" description="We send a link to choose a new one. It expires in one hour.">
      <div className="space-y-5">
        <EmailLinkForm purpose="reset" callbackURL="/reset-password" />
        <p className="text-sm">
          <Link href="/sign-in" className="text-pine-700 underline underline-offset-2 dark:text-pine-300">
            Back to sign in
          </Link>
        </p>
      </div>
    </CenteredCard>
  );
}
