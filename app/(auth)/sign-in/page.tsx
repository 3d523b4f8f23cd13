import type { Metadata } from "next";
import { CenteredCard } from "@/components/shell/centered-layout";
import { safeNext } from "../_components/safe-next";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { next } = await searchParams;
  return (
    <CenteredCard title="Sign in to Peeksafe" description="Watch your campaigns' lift against the holdout, as often as you like.">
      <SignInForm next={safeNext(next)} />
    </CenteredCard>
  );
}
