"use client";
import { createSiteAction, updateSiteAction } from "@/app/(app)/settings/sites/actions";
import type { SiteRow } from "@/db/queries/settings-sites";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { SITE_DEFAULTS, siteSchema, type SiteInput } from "@/lib/settings/schemas";
import { FormError, SubmitButton } from "./form-bits";
import { ROLE_OPTIONS } from "./role-options";
import { useServerForm } from "./use-server-form";

const HOURS = Array.from({ length: 24 }, (_, h) => ({ value: String(h), label: `${String(h).padStart(2, "0")}:00` }));

export function SiteForm({ site, timeZones, onDone }: { site?: SiteRow; timeZones: string[]; onDone: () => void }) {
  const defaults: SiteInput = site
    ? {
        name: site.name,
        timeZone: site.timeZone,
        dayStartHour: site.dayStartHour,
        nightStartHour: site.nightStartHour,
        dayRole: site.dayRole,
        nightRole: site.nightRole,
        escalateAfterMinutes: site.escalateAfterMinutes,
        maxCalibrationIntervalDays: site.maxCalibrationIntervalDays,
        maxHoldMinutes: site.maxHoldMinutes,
      }
    : SITE_DEFAULTS;
  const { form, onSubmit } = useServerForm({
    schema: siteSchema,
    defaultValues: defaults,
    action: (values) => (site ? updateSiteAction({ id: site.id, values }) : createSiteAction(values)),
    success: (d) => (site ? `${d.name} saved.` : `${d.name} added.`),
    onSuccess: onDone,
  });
  const { errors, isSubmitting } = form.formState;
  const asNumber = { valueAsNumber: true } as const;
  const hour = { setValueAs: (v: string) => Number(v) } as const;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={site ? `Edit ${site.name}` : "New site"}>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Site name" error={errors.name?.message}>
          {(c) => <Input {...c} {...form.register("name")} />}
        </Field>
        <Field label="Time zone" error={errors.timeZone?.message} hint="Shift hours are in this time zone.">
          {(c) => (
            <>
              <Input {...c} {...form.register("timeZone")} list="time-zones" autoComplete="off" />
              <datalist id="time-zones">
                {timeZones.map((z) => (
                  <option key={z} value={z} />
                ))}
              </datalist>
            </>
          )}
        </Field>
      </div>
      <fieldset className="grid gap-4 rounded-md border border-paper-line p-3 sm:grid-cols-2">
        <legend className="px-1 text-sm font-semibold">Shifts</legend>
        <Field label="Day shift starts" error={errors.dayStartHour?.message}>
          {(c) => <Select {...c} {...form.register("dayStartHour", hour)} options={HOURS} />}
        </Field>
        <Field label="Night shift starts" error={errors.nightStartHour?.message}>
          {(c) => <Select {...c} {...form.register("nightStartHour", hour)} options={HOURS} />}
        </Field>
        <Field label="Paged by day" error={errors.dayRole?.message}>
          {(c) => <Select {...c} {...form.register("dayRole")} options={ROLE_OPTIONS} />}
        </Field>
        <Field label="Paged at night" error={errors.nightRole?.message}>
          {(c) => <Select {...c} {...form.register("nightRole")} options={ROLE_OPTIONS} />}
        </Field>
        <Field label="Escalate after (min)" error={errors.escalateAfterMinutes?.message} hint="An incident nobody has acknowledged escalates after this long." className="sm:col-span-2">
          {(c) => <Input {...c} {...form.register("escalateAfterMinutes", asNumber)} type="number" inputMode="numeric" min={1} max={240} />}
        </Field>
      </fieldset>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Maximum calibration interval (days)" error={errors.maxCalibrationIntervalDays?.message} hint="No tank here may go longer between calibrations.">
          {(c) => <Input {...c} {...form.register("maxCalibrationIntervalDays", asNumber)} type="number" inputMode="numeric" min={1} max={365} />}
        </Field>
        <Field label="Maximum hold length (min)" error={errors.maxHoldMinutes?.message}>
          {(c) => <Input {...c} {...form.register("maxHoldMinutes", asNumber)} type="number" inputMode="numeric" min={5} max={1440} />}
        </Field>
      </div>
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting}>{site ? "Save site" : "Add site"}</SubmitButton>
    </form>
  );
}
