"use client";
import { renameOrganisationAction } from "@/app/(app)/settings/users/actions";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { organisationSchema } from "@/lib/settings/schemas";
import { FormError, SubmitButton } from "./form-bits";
import { useServerForm } from "./use-server-form";

export function OrganisationForm({ name }: { name: string }) {
  const { form, onSubmit } = useServerForm({
    schema: organisationSchema,
    defaultValues: { name },
    action: renameOrganisationAction,
    success: (d) => `Farm renamed to ${d.name}.`,
  });
  const { errors, isSubmitting } = form.formState;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3">
      <Field label="Farm name" error={errors.name?.message}>
        {(c) => <Input {...c} {...form.register("name")} autoComplete="organization" />}
      </Field>
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting}>Save name</SubmitButton>
    </form>
  );
}
