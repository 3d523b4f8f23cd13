import type { Metadata } from "next";
import { CenteredCard } from "@/components/shell/centered-layout";
import { safeNext } from "../_components/safe-next";
import { SignUpForm } from "./sign-up-form";

export const metadata: Metadata = { title: "Create an account" };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { next, email } = await searchParams;
  return (
    <CenteredCard title="Create your Peeksafe account" description="You confirm your e-mail address, then set up or join a workspace.">
      <SignUpForm next={safeNext(next)} email={typeof email === "string" ? email.slice(0, 254) : undefined} />
    </CenteredCard>
  );
}
