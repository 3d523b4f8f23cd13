"use client";

import { ScreenError } from "@/components/dashboard/screen-states";

export default function ErrorScreen({ reset }: { error: Error; reset: () => void }) {
  return <ScreenError what="The planner" reset={reset} />;
}
