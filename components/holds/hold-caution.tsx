import { ShieldAlert } from "lucide-react";

/** Shown where the maintenance work starts: the hold dialog. */
export function HoldCaution() {
  return (
    <div role="note" className="flex gap-2 rounded-md border border-warn/40 bg-warn/10 p-3 text-sm text-ink">
      <ShieldAlert className="mt-0.5 size-4 shrink-0 text-warn" aria-hidden />
      <p>
        pH-up and pH-down solutions are corrosive: wear gloves and eye protection when handling buffers, cleaning agents and nutrient solution. Glass
        probes are fragile — handle them by the body, never the bulb. Follow the probe and controller makers&apos; instructions.
      </p>
    </div>
  );
}
