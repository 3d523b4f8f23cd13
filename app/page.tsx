import { redirect } from "next/navigation";
import { requireWorkspace } from "@/lib/auth/session";

export default async function Home() {
  await requireWorkspace();
  redirect("/campaigns");
}
