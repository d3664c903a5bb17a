import { ShieldAlert } from "lucide-react";

/** The caution shown where probes are handled (DESIGN.md, Safety). */
export function ProbeSafetyNote() {
  return (
    <p className="flex items-start gap-2 rounded-md border border-warn/30 bg-warn/5 px-3 py-2 text-sm text-ink">
      <ShieldAlert className="mt-0.5 size-4 shrink-0 text-warn" aria-hidden />
      <span>
        Glass probes break: handle them by the body, keep the bulb wet and capped. Wear gloves and eye protection near pH-up, pH-down, buffers and
        cleaning solutions, and follow the probe maker&apos;s instructions. Place the tank on hold before taking a probe out.
      </span>
    </p>
  );
}
