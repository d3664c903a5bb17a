import { forwardRef } from "react";
import { cn } from "./cn";

export const inputClass =
  "h-11 w-full rounded-md border border-paper-line bg-white px-3 text-base text-ink placeholder:text-ink-faint aria-[invalid=true]:border-bad aria-[invalid=true]:ring-1 aria-[invalid=true]:ring-bad/40 disabled:bg-paper-sunk sm:text-sm";

export const Input = forwardRef<HTMLInputElement, React.InputHTMLAttributes<HTMLInputElement>>(function Input({ className, ...props }, ref) {
  return <input ref={ref} className={cn(inputClass, className)} {...props} />;
});
