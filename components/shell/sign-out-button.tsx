"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { authClient } from "@/lib/auth/client";

/** Signs out and goes to sign-in (with `next` to come back to, when given). */
export function SignOutButton({ next }: { next?: string }) {
  const router = useRouter();
  const [pending, setPending] = useState(false);
  async function signOut() {
    setPending(true);
    await authClient.signOut();
    router.push(next ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in");
    router.refresh();
  }
  return (
    <Button variant="secondary" size="sm" pending={pending} onClick={() => void signOut()}>
      Sign out
    </Button>
  );
}
