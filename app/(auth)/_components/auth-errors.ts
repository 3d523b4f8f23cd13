/** better-auth error codes in the words our screens show. */
const MESSAGES: Record<string, string> = {
  INVALID_EMAIL_OR_PASSWORD: "The e-mail address or the password is wrong.",
  EMAIL_NOT_VERIFIED: "Confirm your e-mail address first: open the link we sent you.",
  USER_ALREADY_EXISTS: "An account with this e-mail address exists already. Sign in instead.",
  USER_ALREADY_EXISTS_USE_ANOTHER_EMAIL: "An account with this e-mail address exists already. Sign in instead.",
  PASSWORD_TOO_SHORT: "The password needs at least 10 characters.",
  PASSWORD_TOO_LONG: "The password is too long.",
  INVALID_TOKEN: "This link is not valid (any more). Ask for a new one.",
  TOKEN_EXPIRED: "This link has expired. Ask for a new one.",
  INVALID_USER: "This link belongs to a different account than the one signed in. Sign out and open it again.",
  USER_NOT_FOUND: "No account belongs to this link.",
  TOO_MANY_REQUESTS: "Too many attempts. Wait a minute and try again.",
};

export function authErrorMessage(error: { code?: string; status?: number; message?: string } | null | undefined): string {
  if (!error) return "Something went wrong. Try again.";
  if (error.status === 429) return MESSAGES.TOO_MANY_REQUESTS;
  return (error.code && MESSAGES[error.code]) || "Something went wrong. Try again.";
}

export function authCodeMessage(code: string): string {
  return MESSAGES[code] ?? "This link did not work. Ask for a new one.";
}
