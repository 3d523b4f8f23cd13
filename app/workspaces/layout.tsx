import type { ReactNode } from "react";
import { CenteredLayout } from "@/components/shell/centered-layout";

export default function WorkspacesLayout({ children }: { children: ReactNode }) {
  return <CenteredLayout>{children}</CenteredLayout>;
}
