import type { Metadata } from "next";
import { CampaignForm } from "@/components/campaigns/campaign-form";
import { requirePageRole } from "@/lib/auth/session";

export const metadata: Metadata = { title: "New campaign · Peeksafe" };

export default async function NewCampaignPage() {
  await requirePageRole({ campaign: ["create"] });
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-xl font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">Register a campaign</h1>
        <p className="mt-1 text-sm text-tremor-content dark:text-dark-tremor-content">
          The plan fixes the fixed-horizon sample size and the always-valid test&apos;s tuning before any data arrives.
        </p>
      </div>
      <CampaignForm />
    </div>
  );
}
