"use client";
// One form pattern for every settings form: react-hook-form validates in the browser with the shared
// zod schema, the server action parses with the same schema, and the server's field errors
// (`error.fields`) land under the same fields. Results are announced with a toast.
import { useForm, type DefaultValues, type FieldValues, type Path, type UseFormReturn } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { toast } from "sonner";
import type { z } from "zod";
import type { ActionResult } from "@/app/_server/guard";

export type ServerAction<I, T> = (input: I) => Promise<ActionResult<T>>;

/** Puts the server's field messages under their fields; the rest goes to the form's root error. */
export function applyServerError<V extends FieldValues>(form: UseFormReturn<V, unknown, FieldValues>, error: { message: string; fields?: Record<string, string> }) {
  const known = new Set(Object.keys(form.getValues()));
  let placed = false;
  for (const [field, message] of Object.entries(error.fields ?? {})) {
    if (known.has(field.split(".")[0])) {
      form.setError(field as Path<V>, { type: "server", message }, { shouldFocus: !placed });
      placed = true;
    }
  }
  form.setError("root.server", { type: "server", message: error.message });
  toast.error(error.message);
}

export function useServerForm<S extends z.ZodType<FieldValues, FieldValues>, T>(opts: {
  schema: S;
  defaultValues: DefaultValues<z.input<S>>;
  action: ServerAction<z.output<S>, T>;
  success: (data: T) => string;
  onSuccess?: (data: T, form: UseFormReturn<z.input<S>, unknown, z.output<S>>) => void;
}) {
  const form = useForm<z.input<S>, unknown, z.output<S>>({ resolver: zodResolver(opts.schema as never), defaultValues: opts.defaultValues, mode: "onTouched" });
  const onSubmit = form.handleSubmit(async (values) => {
    const result = await opts.action(values);
    if (result.ok) {
      toast.success(opts.success(result.data));
      opts.onSuccess?.(result.data, form);
    } else {
      applyServerError(form as unknown as UseFormReturn<FieldValues, unknown, FieldValues>, result.error);
    }
  });
  return { form, onSubmit };
}

/** Runs an action outside a form (buttons in tables); toasts the outcome; resolves whether it worked. */
export async function runAction<T>(call: () => Promise<ActionResult<T>>, success: (data: T) => string): Promise<T | null> {
  const result = await call();
  if (result.ok) {
    toast.success(success(result.data));
    return result.data;
  }
  toast.error(result.error.message);
  return null;
}
