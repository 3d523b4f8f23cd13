"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { authClient } from "@/lib/auth/client";
import { hardNavigate } from "./hard-navigate";

/** Signs out and goes to sign-in (with `next` to come back to, when given). */
export function SignOutButton({ next }: { next?: string }) {
  const [pending, setPending] = useState(false);
  async function signOut() {
    setPending(true);
    await authClient.signOut();
    hardNavigate(next ? `/sign-in?next=${encodeURIComponent(next)}` : "/sign-in");
  }
  return (
    <Button variant="secondary" size="sm" pending={pending} onClick={() => void signOut()}>
      Sign out
    </Button>
  );
}
