import { forwardRef, type InputHTMLAttributes, type SelectHTMLAttributes } from "react";
import { cn } from "./cn";

export const controlClasses =
  "block w-full rounded-tremor-default border-tremor-border bg-white text-sm text-tremor-content-strong shadow-tremor-input placeholder:text-tremor-content-subtle focus:border-pine-500 focus:ring-pine-500 aria-[invalid=true]:border-red-600 dark:border-dark-tremor-border dark:bg-dark-tremor-background dark:text-dark-tremor-content-strong dark:placeholder:text-dark-tremor-content-subtle dark:aria-[invalid=true]:border-red-400";

export const Input = forwardRef<HTMLInputElement, InputHTMLAttributes<HTMLInputElement>>(function Input({ className, ...rest }, ref) {
  return <input ref={ref} className={cn(controlClasses, className)} {...rest} />;
});

export const Select = forwardRef<HTMLSelectElement, SelectHTMLAttributes<HTMLSelectElement>>(function Select({ className, children, ...rest }, ref) {
  return (
    <select ref={ref} className={cn(controlClasses, "pr-8", className)} {...rest}>
      {children}
    </select>
  );
});
