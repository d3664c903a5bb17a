"use client";
import { updatePreferencesAction } from "@/app/(app)/settings/preferences/actions";
import { CheckField, Field } from "@/components/ui/field";
import { Select } from "@/components/ui/select";
import { ecUnitLabel, formatEc, type EcUnit } from "@/lib/display/units";
import { EC_UNITS } from "@/lib/settings/enums";
import { preferencesSchema } from "@/lib/settings/schemas";
import { FormError, SubmitButton } from "./form-bits";
import { useServerForm } from "./use-server-form";

const EXAMPLE_US = 1800;

export function PreferencesForm({ preferences }: { preferences: { ecUnit: EcUnit; notifyEmail: boolean; wallSound: boolean } }) {
  const { form, onSubmit } = useServerForm({
    schema: preferencesSchema,
    defaultValues: preferences,
    action: updatePreferencesAction,
    success: () => "Preferences saved.",
  });
  const { errors, isSubmitting } = form.formState;
  const unit = form.watch("ecUnit") ?? preferences.ecUnit;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5" aria-label="Preferences">
      <Field label="Show EC in" error={errors.ecUnit?.message} hint={`For example, 1.80 mS/cm shows as ${formatEc(EXAMPLE_US, unit)} ${ecUnitLabel(unit)}. Stored values do not change.`}>
        {(c) => <Select {...c} {...form.register("ecUnit")} options={EC_UNITS.map((u) => ({ value: u, label: ecUnitLabel(u) }))} />}
      </Field>
      <CheckField label="E-mail me about incidents when I am on shift" error={errors.notifyEmail?.message}>
        {(c) => <input {...c} {...form.register("notifyEmail")} type="checkbox" className="size-6 accent-accent-700" />}
      </CheckField>
      <CheckField label="Play a sound on the tank wall when an incident opens" error={errors.wallSound?.message} hint="Browsers play sound only after you have clicked on the page once.">
        {(c) => <input {...c} {...form.register("wallSound")} type="checkbox" className="size-6 accent-accent-700" />}
      </CheckField>
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting}>Save preferences</SubmitButton>
    </form>
  );
}
