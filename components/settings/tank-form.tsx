"use client";
import { useState } from "react";
import { Controller } from "react-hook-form";
import { createTankAction, updateTankAction } from "@/app/(app)/settings/tanks/actions";
import type { SiteRow } from "@/db/queries/settings-sites";
import type { TankSettingsRow } from "@/db/queries/settings-tanks";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { ecUnitLabel, type EcUnit } from "@/lib/display/units";
import { CROP_NAMES, presetBand, type CropPreset } from "@/lib/settings/crop-presets";
import { tankSchema, type TankInput } from "@/lib/settings/schemas";
import { EcInput } from "./ec-input";
import { FormError, SubmitButton, nullableNumber } from "./form-bits";
import { useServerForm } from "./use-server-form";

type Tank = TankSettingsRow["tank"];

function defaultsFor(tank: Tank | undefined, sites: SiteRow[]): TankInput {
  if (tank) {
    const { siteId, zoneId, name, crop, phMin, phMax, ecMinUs, ecMaxUs, tempMin, tempMax, ecAlphaPerC, spotCheckTolerancePh, spotCheckToleranceEcUs, calibrationIntervalDays } = tank;
    return { siteId, zoneId, name, crop, phMin, phMax, ecMinUs, ecMaxUs, tempMin, tempMax, ecAlphaPerC, spotCheckTolerancePh, spotCheckToleranceEcUs, calibrationIntervalDays };
  }
  const site = sites[0];
  return {
    siteId: site?.id ?? 0,
    zoneId: site?.zones[0]?.id ?? null,
    name: "",
    crop: "leafy greens",
    ...presetBand("leafy greens"),
    ecAlphaPerC: 0.019, // DOMAIN.md section 3: default 0.019 per °C (common practice)
    spotCheckTolerancePh: 0.1,
    spotCheckToleranceEcUs: 100,
    calibrationIntervalDays: Math.min(30, site?.maxCalibrationIntervalDays ?? 30),
  };
}

export function TankForm({ tank, sites, ecUnit, onDone }: { tank?: Tank; sites: SiteRow[]; ecUnit: EcUnit; onDone: () => void }) {
  const { form, onSubmit } = useServerForm({
    schema: tankSchema,
    defaultValues: defaultsFor(tank, sites),
    action: (values) => (tank ? updateTankAction({ id: tank.id, values }) : createTankAction(values)),
    success: (d) => (tank ? `${d.name} saved.` : `${d.name} added.`),
    onSuccess: onDone,
  });
  const { errors, isSubmitting } = form.formState;
  const [presetsApplied, setPresetsApplied] = useState(0);
  const siteId = form.watch("siteId");
  const site = sites.find((s) => s.id === siteId);
  const num = { valueAsNumber: true } as const;
  const ecField = (name: "ecMinUs" | "ecMaxUs" | "spotCheckToleranceEcUs", label: string, hint?: string) => (
    <Field label={`${label} (${ecUnitLabel(ecUnit).replace(/[()]/g, "")})`} error={errors[name]?.message} hint={hint}>
      {(c) => <Controller control={form.control} name={name} render={({ field }) => <EcInput control={c} valueUs={field.value} unit={ecUnit} onChange={field.onChange} onBlur={field.onBlur} />} />}
    </Field>
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={tank ? `Edit ${tank.name}` : "New tank"}>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Tank name" error={errors.name?.message}>
          {(c) => <Input {...c} {...form.register("name")} />}
        </Field>
        <Field label="Site" error={errors.siteId?.message}>
          {(c) => (
            <Select
              {...c}
              {...form.register("siteId", {
                setValueAs: Number,
                onChange: (e) => form.setValue("zoneId", sites.find((s) => s.id === Number(e.target.value))?.zones[0]?.id ?? null),
              })}
              options={sites.map((s) => ({ value: String(s.id), label: s.name }))}
            />
          )}
        </Field>
        <Field label="Zone" error={errors.zoneId?.message}>
          {(c) => (
            // Controlled: its options change with the site, and the value must follow them.
            <Controller
              control={form.control}
              name="zoneId"
              render={({ field }) => (
                <Select
                  {...c}
                  name={field.name}
                  ref={field.ref}
                  value={field.value === null ? "" : String(field.value)}
                  onChange={(e) => field.onChange(nullableNumber(e.target.value))}
                  onBlur={field.onBlur}
                  placeholder="No zone"
                  options={(site?.zones ?? []).map((z) => ({ value: String(z.id), label: z.name }))}
                />
              )}
            />
          )}
        </Field>
        <Field label="Crop" error={errors.crop?.message} hint="Choosing a listed crop fills in its common target band; edit it to suit your cultivar.">
          {(c) => (
            <>
              <Input
                {...c}
                {...form.register("crop", {
                  onChange: (e) => {
                    const preset = e.target.value as CropPreset;
                    if (!CROP_NAMES.includes(preset)) return;
                    for (const [k, v] of Object.entries(presetBand(preset))) form.setValue(k as keyof TankInput, v, { shouldValidate: true });
                    setPresetsApplied((n) => n + 1);
                  },
                })}
                list="crop-presets"
                autoComplete="off"
              />
              <datalist id="crop-presets">
                {CROP_NAMES.map((c) => (
                  <option key={c} value={c} />
                ))}
              </datalist>
            </>
          )}
        </Field>
      </div>

      {/* Re-mounted when a preset is applied, so the EC inputs (which keep their own text) show it. */}
      <fieldset key={presetsApplied} className="grid gap-4 rounded-md border border-paper-line p-3 sm:grid-cols-2">
        <legend className="px-1 text-sm font-semibold">Target band</legend>
        <Field label="pH minimum" error={errors.phMin?.message}>
          {(c) => <Input {...c} {...form.register("phMin", num)} type="number" step="0.01" inputMode="decimal" />}
        </Field>
        <Field label="pH maximum" error={errors.phMax?.message}>
          {(c) => <Input {...c} {...form.register("phMax", num)} type="number" step="0.01" inputMode="decimal" />}
        </Field>
        {ecField("ecMinUs", "EC minimum")}
        {ecField("ecMaxUs", "EC maximum")}
        <Field label="Solution temperature minimum (°C)" error={errors.tempMin?.message}>
          {(c) => <Input {...c} {...form.register("tempMin", num)} type="number" step="0.1" inputMode="decimal" />}
        </Field>
        <Field label="Solution temperature maximum (°C)" error={errors.tempMax?.message}>
          {(c) => <Input {...c} {...form.register("tempMax", num)} type="number" step="0.1" inputMode="decimal" />}
        </Field>
      </fieldset>

      <fieldset className="grid gap-4 rounded-md border border-paper-line p-3 sm:grid-cols-2">
        <legend className="px-1 text-sm font-semibold">Probes and calibration</legend>
        <Field label="EC temperature coefficient (per °C)" error={errors.ecAlphaPerC?.message} hint="Nutrient solutions are about 0.019–0.021; compensates EC to 25 °C.">
          {(c) => <Input {...c} {...form.register("ecAlphaPerC", num)} type="number" step="0.0001" inputMode="decimal" />}
        </Field>
        <Field
          label="Calibration interval (days)"
          error={errors.calibrationIntervalDays?.message}
          hint={site ? `At most ${site.maxCalibrationIntervalDays} days at ${site.name}.` : undefined}
        >
          {(c) => <Input {...c} {...form.register("calibrationIntervalDays", num)} type="number" inputMode="numeric" min={1} max={site?.maxCalibrationIntervalDays} />}
        </Field>
        <Field label="pH spot-check tolerance" error={errors.spotCheckTolerancePh?.message} hint="A hand-meter check differing by more is flagged.">
          {(c) => <Input {...c} {...form.register("spotCheckTolerancePh", num)} type="number" step="0.01" inputMode="decimal" />}
        </Field>
        {ecField("spotCheckToleranceEcUs", "EC spot-check tolerance")}
      </fieldset>
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting}>{tank ? "Save tank" : "Add tank"}</SubmitButton>
    </form>
  );
}
