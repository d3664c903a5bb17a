"use client";
// The small dialog for placing a hold: why, and for how long (the site caps the length).
import { useEffect, useId, useRef } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { HoldCaution } from "./hold-caution";

export const REASONS = ["Probe cleaning and calibration", "EC standard check", "Reservoir change", "Dosing line maintenance"];
const LENGTHS = [15, 30, 45, 60, 90, 120];

const schema = z.object({
  reason: z.string().trim().min(1, "Say why the tank is held").max(300),
  minutes: z.number({ error: "Give the length in minutes" }).int().min(1, "At least 1 minute").max(24 * 60),
});
export type HoldForm = z.infer<typeof schema>;

/** Mounted only while open: it opens as a modal dialog and closes with Escape or Cancel. */
export function HoldDialog({
  tankName,
  onClose,
  onSubmit,
  serverError,
}: {
  tankName: string;
  onClose: () => void;
  onSubmit: (v: HoldForm) => Promise<void>;
  serverError: { message: string; fields?: Record<string, string> } | null;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const id = useId();
  const form = useForm<HoldForm>({ resolver: zodResolver(schema), defaultValues: { reason: REASONS[0], minutes: 30 } });
  const { register, handleSubmit, formState, setValue } = form;

  useEffect(() => {
    const d = ref.current;
    if (d && !d.open) d.showModal();
  }, []);

  const minutesError = formState.errors.minutes?.message ?? serverError?.fields?.minutes;
  return (
    <dialog
      ref={ref}
      onClose={onClose}
      aria-labelledby={`${id}-title`}
      className="m-auto w-[min(32rem,calc(100vw-2rem))] rounded-xl border border-paper-line bg-paper-raised p-0 text-ink shadow-xl backdrop:bg-ink/40"
    >
      <form onSubmit={handleSubmit(onSubmit)} className="space-y-4 p-5">
        <h2 id={`${id}-title`} className="text-lg font-semibold">
          Put {tankName} on hold
        </h2>
        <p className="text-sm text-ink-soft">
          While held, alerts for this tank are silenced, its controller is told to stop dosing and readings are flagged as held. Releasing it brings alerts
          back after a short settling period. A hold that runs past its planned end raises an alert.
        </p>
        <HoldCaution />
        <label className="block text-sm font-medium">
          Reason
          <input list={`${id}-reasons`} className="mt-1 h-11 w-full rounded-md border border-paper-line bg-paper px-3 text-base" {...register("reason")} />
          <datalist id={`${id}-reasons`}>
            {REASONS.map((r) => (
              <option key={r} value={r} />
            ))}
          </datalist>
          {formState.errors.reason ? <span className="mt-1 block text-sm text-bad">{formState.errors.reason.message}</span> : null}
        </label>
        <fieldset>
          <legend className="text-sm font-medium">Planned length</legend>
          <div className="mt-1 flex flex-wrap gap-2">
            {LENGTHS.map((m) => (
              <Button key={m} type="button" size="sm" variant="secondary" onClick={() => setValue("minutes", m, { shouldValidate: true })}>
                {m} min
              </Button>
            ))}
          </div>
          <label className="mt-2 flex items-center gap-2 text-sm">
            <input type="number" inputMode="numeric" aria-label="Minutes" className="h-11 w-24 rounded-md border border-paper-line bg-paper px-3 text-base" {...register("minutes", { valueAsNumber: true })} />
            minutes
          </label>
          {minutesError ? <span className="mt-1 block text-sm text-bad">{minutesError}</span> : null}
        </fieldset>
        {serverError && !serverError.fields?.minutes ? (
          <p role="alert" className="text-sm text-bad">
            {serverError.message}
          </p>
        ) : null}
        <div className="flex justify-end gap-2">
          <Button type="button" variant="secondary" size="lg" onClick={onClose}>
            Cancel
          </Button>
          <Button type="submit" size="lg" disabled={formState.isSubmitting}>
            {formState.isSubmitting ? "Placing hold…" : "Place hold"}
          </Button>
        </div>
      </form>
    </dialog>
  );
}
