"use client";
import { Send } from "lucide-react";
import { inviteUserAction } from "@/app/(app)/settings/users/actions";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { Select } from "@/components/ui/select";
import { inviteUserSchema } from "@/lib/settings/schemas";
import { FormError, SubmitButton } from "./form-bits";
import { ROLE_OPTIONS } from "./role-options";
import { useServerForm } from "./use-server-form";

export function InviteForm() {
  const { form, onSubmit } = useServerForm({
    schema: inviteUserSchema,
    defaultValues: { email: "", name: "", role: "grower" },
    action: inviteUserAction,
    success: (d) => (d.mailed ? `Invitation sent to ${d.email}.` : `${d.email} was added, but the e-mail could not be sent; use “Send again”.`),
    onSuccess: (_d, f) => f.reset(),
  });
  const { errors, isSubmitting } = form.formState;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="Invite someone">
      <Field label="Name" error={errors.name?.message}>
        {(c) => <Input {...c} {...form.register("name")} autoComplete="off" />}
      </Field>
      <Field label="E-mail" error={errors.email?.message}>
        {(c) => <Input {...c} {...form.register("email")} type="email" autoComplete="off" />}
      </Field>
      <Field label="Role" error={errors.role?.message} hint="Growers run calibrations, holds and tanks; night managers watch and acknowledge.">
        {(c) => <Select {...c} {...form.register("role")} options={ROLE_OPTIONS} />}
      </Field>
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting} pendingLabel="Sending…">
        <Send className="size-4" aria-hidden /> Send invitation
      </SubmitButton>
    </form>
  );
}
