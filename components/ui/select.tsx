import { forwardRef } from "react";
import { ChevronDown } from "lucide-react";
import { cn } from "./cn";
import { inputClass } from "./input";

export interface SelectOption {
  value: string;
  label: string;
}

/** A native select (works with gloves, screen readers and phone pickers), styled like Input. */
export const Select = forwardRef<HTMLSelectElement, React.SelectHTMLAttributes<HTMLSelectElement> & { options: SelectOption[]; placeholder?: string }>(function Select(
  { className, options, placeholder, ...props },
  ref,
) {
  return (
    <div className="relative">
      <select ref={ref} className={cn(inputClass, "appearance-none pr-9", className)} {...props}>
        {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
      <ChevronDown className="pointer-events-none absolute right-3 top-1/2 size-4 -translate-y-1/2 text-ink-soft" aria-hidden />
    </div>
  );
});
