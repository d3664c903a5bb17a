"use client";
import { useRouter } from "next/navigation";
import { KeyRound } from "lucide-react";
import { acceptInvitationAction } from "@/app/invite/[token]/actions";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { PASSWORD_MIN, acceptInvitationSchema } from "@/lib/settings/schemas";
import { FormError, SubmitButton } from "./form-bits";
import { useServerForm } from "./use-server-form";

export function AcceptInvitationForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const { form, onSubmit } = useServerForm({
    schema: acceptInvitationSchema,
    defaultValues: { token, password: "", repeat: "" },
    action: acceptInvitationAction,
    success: () => "Password set. Sign in to start.",
    onSuccess: (d) => router.push(`/sign-in?email=${encodeURIComponent(d.email)}`),
  });
  const { errors, isSubmitting } = form.formState;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <input type="hidden" {...form.register("token")} />
      <input type="email" value={email} autoComplete="username" readOnly hidden />
      <Field label="New password" error={errors.password?.message} hint={`At least ${PASSWORD_MIN} characters.`}>
        {(c) => <Input {...c} {...form.register("password")} type="password" autoComplete="new-password" className="h-12" />}
      </Field>
      <Field label="Repeat password" error={errors.repeat?.message}>
        {(c) => <Input {...c} {...form.register("repeat")} type="password" autoComplete="new-password" className="h-12" />}
      </Field>
      <FormError errors={errors} />
      <SubmitButton pending={isSubmitting}>
        <KeyRound className="size-4" aria-hidden /> Set password
      </SubmitButton>
    </form>
  );
}
