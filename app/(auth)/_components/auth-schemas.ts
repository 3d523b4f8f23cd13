import { z } from "zod";

export const MIN_PASSWORD_LENGTH = 10;

const email = z.string().trim().min(1, "Enter your e-mail address").email("Enter a valid e-mail address");
const newPassword = z.string().min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters`).max(128, "At most 128 characters");

export const signInSchema = z.object({ email, password: z.string().min(1, "Enter your password") });
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: z.string().trim().min(1, "Enter your name").max(80, "At most 80 characters"),
  email,
  password: newPassword,
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const emailOnlySchema = z.object({ email });
export type EmailOnlyInput = z.infer<typeof emailOnlySchema>;

export const resetPasswordSchema = z
  .object({ password: newPassword, confirm: z.string() })
  .refine((value) => value.password === value.confirm, { path: ["confirm"], message: "The two passwords differ" });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;
