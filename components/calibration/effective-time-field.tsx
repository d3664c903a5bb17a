"use client";
// When a guided run takes effect: now (the usual case), or the typed time it was really done, for
// a run entered late. Readings stored since that time are corrected again on save.
import { useState } from "react";
import { toLocalInput } from "./probe-options";
import { FIELD_CLASS } from "./probe-select";

/** `value` is null for "now", else the typed time (ms); NaN while the typed text is incomplete. */
export function EffectiveTimeField({ value, onChange, error }: { value: number | null; onChange: (at: number | null) => void; error?: string }) {
  const [typed, setTyped] = useState(() => toLocalInput(Date.now() - 60 * 60_000));
  const late = value !== null;
  return (
    <fieldset className="space-y-2 rounded-md border border-paper-line p-3" data-effective-time>
      <legend className="px-1 text-sm font-semibold">In force from</legend>
      <label className="flex items-center gap-2 text-sm">
        <input type="radio" name="effective" className="size-5" checked={!late} onChange={() => onChange(null)} />
        Now, when I save
      </label>
      <label className="flex items-center gap-2 text-sm">
        <input type="radio" name="effective" className="size-5" checked={late} onChange={() => onChange(new Date(typed).getTime())} />
        Earlier: this run was done before it was entered
      </label>
      {late ? (
        <label className="block max-w-xs text-sm font-medium">
          Done at (your local time)
          <input
            className={`${FIELD_CLASS} ${error ? "border-bad ring-1 ring-bad" : ""}`}
            type="datetime-local"
            name="effectiveAt"
            value={typed}
            aria-invalid={error ? true : undefined}
            onChange={(e) => {
              setTyped(e.target.value);
              onChange(new Date(e.target.value).getTime());
            }}
          />
          <span className="block text-xs font-normal text-ink-soft">Not in the future, and after the probe&apos;s previous accepted calibration. Readings stored since then are corrected again.</span>
        </label>
      ) : null}
      {error ? <p className="text-xs font-medium text-bad">{error}</p> : null}
    </fieldset>
  );
}
