import { forwardRef } from "react";
import { cn } from "./cn";

const variants = {
  primary: "bg-accent-700 text-white hover:bg-accent-800 disabled:bg-accent-700/50",
  secondary: "bg-paper-raised text-ink border border-paper-line hover:bg-paper-sunk",
  danger: "bg-bad text-white hover:bg-bad/90",
  ghost: "text-ink-soft hover:bg-paper-sunk hover:text-ink",
} as const;
const sizes = { sm: "h-8 px-3 text-sm", md: "h-10 px-4 text-sm", lg: "h-12 px-5 text-base" } as const;

export interface ButtonProps extends React.ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: keyof typeof variants;
  size?: keyof typeof sizes;
}

export const Button = forwardRef<HTMLButtonElement, ButtonProps>(function Button({ className, variant = "primary", size = "md", ...props }, ref) {
  return (
    <button
      ref={ref}
      className={cn(
        "inline-flex items-center justify-center gap-2 rounded-md font-medium transition-colors disabled:cursor-not-allowed",
        variants[variant],
        sizes[size],
        className,
      )}
      {...props}
    />
  );
});
