import { ScreenLoading } from "@/components/dashboard/screen-states";

export default function Loading() {
  return <ScreenLoading label="Loading the campaign…" />;
}
