"use client";

import { useState } from "react";
import type { ActionResult } from "../actions";

/** Runs a server action and keeps its pending state and error message for the UI. */
export function useAction<I, T>(action: (input: I) => Promise<ActionResult<T>>) {
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[] | undefined>>({});
  async function run(input: I): Promise<ActionResult<T>> {
    setPending(true);
    setError(null);
    setFieldErrors({});
    try {
      const result = await action(input);
      if (!result.ok) {
        setError(result.error);
        setFieldErrors(result.fieldErrors ?? {});
      }
      return result;
    } catch {
      const failed = { ok: false as const, error: "Something went wrong. Try again." };
      setError(failed.error);
      return failed;
    } finally {
      setPending(false);
    }
  }
  return { run, pending, error, fieldErrors };
}
