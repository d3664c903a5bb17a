"use client";
import { addProbeAction, moveProbeAction, replaceProbeAction } from "@/app/(app)/settings/probes/actions";
import type { ProbeSettingsRow } from "@/db/queries/settings-probes";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { PROBE_KINDS, PROBE_KIND_NAMES } from "@/lib/settings/enums";
import { moveProbeSchema, probeSchema, replaceProbeSchema } from "@/lib/settings/schemas";
import { FormError, SubmitButton, nullableNumber } from "./form-bits";
import { useServerForm } from "./use-server-form";

export interface TankChoice {
  id: number;
  name: string;
  siteName: string;
}
const tankOptions = (tanks: TankChoice[]) => tanks.map((t) => ({ value: String(t.id), label: `${t.name} · ${t.siteName}` }));
const cellConstantHint = "Printed on the probe or its certificate, often 1.0 /cm. Calibrations are accepted within ±10 % of it.";

export function AddProbeForm({ tanks, onDone }: { tanks: TankChoice[]; onDone: () => void }) {
  const { form, onSubmit } = useServerForm({
    schema: probeSchema,
    defaultValues: { tankId: tanks[0]?.id ?? 0, kind: "ph", serial: "", nominalCellConstant: null },
    action: addProbeAction,
    success: (d) => `Probe ${d.serial} added.`,
    onSuccess: onDone,
  });
  const { errors, isSubmitting } = form.formState;
  const kind = form.watch("kind");
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="New probe">
      <Field label="Tank" error={errors.tankId?.message}>
        {(c) => <Select {...c} {...form.register("tankId", { setValueAs: Number })} options={tankOptions(tanks)} />}
      </Field>
      <Field label="Measures" error={errors.kind?.message}>
        {(c) => (
          <Select
            {...c}
            {...form.register("kind", { onChange: (e) => form.setValue("nominalCellConstant", e.target.value === "ec" ? 1 : null) })}
            options={PROBE_KINDS.map((k) => ({ value: k, label: PROBE_KIND_NAMES[k] }))}
          />
        )}
      </Field>
      <Field label="Serial number" error={errors.serial?.message} hint="As the controller reports it; readings are matched to probes by serial.">
        {(c) => <Input {...c} {...form.register("serial")} autoComplete="off" />}
      </Field>
      {kind === "ec" ? (
        <Field label="Nominal cell constant (/cm)" error={errors.nominalCellConstant?.message} hint={cellConstantHint}>
          {(c) => <Input {...c} {...form.register("nominalCellConstant", { setValueAs: nullableNumber })} type="number" step="0.001" inputMode="decimal" />}
        </Field>
      ) : null}
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting}>Add probe</SubmitButton>
    </form>
  );
}

export function MoveProbeForm({ probe, tanks, onDone }: { probe: ProbeSettingsRow["probe"]; tanks: TankChoice[]; onDone: () => void }) {
  const { form, onSubmit } = useServerForm({
    schema: moveProbeSchema,
    defaultValues: { tankId: tanks.find((t) => t.id !== probe.tankId)?.id ?? probe.tankId },
    action: (values) => moveProbeAction({ id: probe.id, values }),
    success: (d) => `Probe ${d.serial} moved.`,
    onSuccess: onDone,
  });
  const { errors, isSubmitting } = form.formState;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={`Move ${probe.serial}`}>
      <p className="text-sm text-ink-soft">Its calibration moves with it. Readings already taken stay with the tank they came from.</p>
      <Field label="Move to tank" error={errors.tankId?.message}>
        {(c) => <Select {...c} {...form.register("tankId", { setValueAs: Number })} options={tankOptions(tanks)} />}
      </Field>
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting}>Move probe</SubmitButton>
    </form>
  );
}

export function ReplaceProbeForm({ probe, onDone }: { probe: ProbeSettingsRow["probe"]; onDone: () => void }) {
  const { form, onSubmit } = useServerForm({
    schema: replaceProbeSchema,
    defaultValues: { serial: "", nominalCellConstant: probe.kind === "ec" ? (probe.nominalCellConstant ?? 1) : null, confirm: true },
    action: (values) => replaceProbeAction({ id: probe.id, values }),
    success: (d) => `Probe ${probe.serial} retired; ${d.serial} installed.`,
    onSuccess: onDone,
  });
  const { errors, isSubmitting } = form.formState;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={`Replace ${probe.serial}`}>
      <p className="text-sm text-ink-soft">
        {probe.serial} is retired and kept in the record; the new probe starts as never calibrated, so calibrate it before trusting its readings.
      </p>
      <Field label="New probe's serial number" error={errors.serial?.message}>
        {(c) => <Input {...c} {...form.register("serial")} autoComplete="off" />}
      </Field>
      {probe.kind === "ec" ? (
        <Field label="Nominal cell constant (/cm)" error={errors.nominalCellConstant?.message} hint={cellConstantHint}>
          {(c) => <Input {...c} {...form.register("nominalCellConstant", { setValueAs: nullableNumber })} type="number" step="0.001" inputMode="decimal" />}
        </Field>
      ) : null}
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting}>Retire and replace</SubmitButton>
    </form>
  );
}
