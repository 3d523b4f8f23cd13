import type { ReactNode } from "react";
import { CenteredLayout } from "@/components/shell/centered-layout";

export default function AuthLayout({ children }: { children: ReactNode }) {
  return <CenteredLayout>{children}</CenteredLayout>;
}
