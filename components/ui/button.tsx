import type { ButtonHTMLAttributes } from "react";
import { cn } from "./cn";

export type ButtonVariant = "primary" | "secondary" | "danger" | "ghost";

const variants: Record<ButtonVariant, string> = {
  primary: "bg-pine-700 text-white hover:bg-pine-800 dark:bg-pine-400 dark:text-pine-950 dark:hover:bg-pine-300",
  secondary:
    "border border-tremor-border bg-white text-tremor-content-strong hover:bg-tremor-background-subtle dark:border-dark-tremor-border dark:bg-dark-tremor-background dark:text-dark-tremor-content-strong dark:hover:bg-dark-tremor-background-subtle",
  danger: "bg-red-700 text-white hover:bg-red-800 dark:bg-red-400 dark:text-red-950 dark:hover:bg-red-300",
  ghost: "text-tremor-content-emphasis hover:bg-tremor-background-subtle dark:text-dark-tremor-content-emphasis dark:hover:bg-dark-tremor-background-subtle",
};

/** Shared look of buttons and button-like links. */
export function buttonClasses(variant: ButtonVariant = "primary", size: "md" | "sm" = "md"): string {
  return cn(
    "inline-flex items-center justify-center gap-2 rounded-tremor-default font-medium transition-colors disabled:cursor-not-allowed disabled:opacity-60",
    size === "md" ? "px-4 py-2 text-sm" : "px-2.5 py-1 text-xs",
    variants[variant],
  );
}

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  size?: "md" | "sm";
  /** Shows the label with a trailing ellipsis and disables the button while work is in flight. */
  pending?: boolean;
}

export function Button({ variant = "primary", size = "md", pending = false, className, children, disabled, type = "button", ...rest }: ButtonProps) {
  return (
    <button type={type} className={cn(buttonClasses(variant, size), className)} disabled={disabled || pending} aria-busy={pending || undefined} {...rest}>
      {children}
      {pending ? "…" : null}
    </button>
  );
}
