import { Glasses, Hand, ShieldAlert } from "lucide-react";

/** The cautions shown where calibration work happens. */
export function SafetyCautions({ compact = false }: { compact?: boolean }) {
  return (
    <aside aria-label="Safety" data-testid="safety-cautions" className="rounded-lg border border-warn/40 bg-warn/5 p-3 text-sm">
      <p className="flex items-center gap-2 font-semibold text-warn">
        <ShieldAlert className="size-4" aria-hidden /> Safety
      </p>
      <ul className={compact ? "mt-1 space-y-0.5 text-ink-soft" : "mt-2 space-y-1 text-ink-soft"}>
        <li className="flex gap-2">
          <Glasses className="mt-0.5 size-4 shrink-0" aria-hidden /> Wear gloves and eye protection when handling buffers, standards and pH-up or pH-down solutions.
        </li>
        <li className="flex gap-2">
          <Hand className="mt-0.5 size-4 shrink-0" aria-hidden /> Glass probes are fragile: handle them gently, blot (do not wipe) the bulb, never let it dry out.
        </li>
        <li className="flex gap-2">
          <ShieldAlert className="mt-0.5 size-4 shrink-0" aria-hidden /> Follow the probe maker&apos;s instructions; they take precedence over these steps.
        </li>
      </ul>
    </aside>
  );
}
