import type { Metadata } from "next";
import { connection } from "next/server";
import { PlannerForm } from "@/components/dashboard/planner-form";
import { requirePageRole } from "@/lib/auth/session";

export const metadata: Metadata = { title: "Planner · Peeksafe" };

export default async function PlannerPage() {
  await connection();
  await requirePageRole({ campaign: ["read"] });
  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-xl font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">Planner</h1>
        <p className="mt-1 max-w-3xl text-sm text-tremor-content dark:text-dark-tremor-content">
          How many units and days a plan needs with the classic fixed-horizon test, and how soon the always-valid design reaches a call for the same plan when
          the true lift is zero, half the minimum lift, the minimum lift, or twice it.
        </p>
      </div>
      <PlannerForm />
    </div>
  );
}
