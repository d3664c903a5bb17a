import { cn } from "./ui/cn";

/** The Tidewell mark: a tank cross-section with a wave line. */
export function Logo({ inverted = false, compact = false }: { inverted?: boolean; compact?: boolean }) {
  return (
    <span className={cn("inline-flex items-center gap-2 font-semibold tracking-tight", inverted ? "text-white" : "text-accent-800")}>
      <svg viewBox="0 0 32 32" className="size-7" aria-hidden>
        <rect x="3" y="5" width="26" height="23" rx="5" fill="none" stroke="currentColor" strokeWidth="2.5" />
        <path d="M5 17 q3.5 -3 7 0 t7 0 t7 0 v7 a3 3 0 0 1 -3 3 h-15 a3 3 0 0 1 -3 -3z" fill="currentColor" opacity="0.85" />
      </svg>
      {compact ? null : <span className="text-lg">Tidewell</span>}
    </span>
  );
}
