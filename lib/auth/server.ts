import { nextCookies } from "better-auth/next-js";
import { createAuth, type Auth } from "./create-auth";

const globalForAuth = globalThis as unknown as { peeksafeAuth?: Auth };

/** The better-auth instance of the Next server (`nextCookies()` last, so server actions can sign in). */
export function getAuth(): Auth {
  globalForAuth.peeksafeAuth ??= createAuth([nextCookies()]);
  return globalForAuth.peeksafeAuth;
}
