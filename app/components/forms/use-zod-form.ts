import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useRef } from "react";
import { useForm, type DefaultValues, type FieldValues, type UseFormReturn } from "react-hook-form";
import { useSubmit } from "react-router";
import type { z } from "zod";

/** The react-hook-form state of a form checked by a zod schema: what is typed in, and what the schema makes of it. */
export type ZodForm<S extends z.ZodType<FieldValues, FieldValues>> = UseFormReturn<z.input<S>, unknown, z.output<S>>;

/**
 * react-hook-form with the route's zod schema. The form still posts as an ordinary HTML form (so it
 * works before JavaScript loads); with JavaScript the same schema checks it first and the post goes
 * through React Router's submit, and the action re-validates with that schema.
 */
export function useZodForm<Output extends FieldValues, Input extends FieldValues>(schema: z.ZodType<Output, Input>, defaultValues?: DefaultValues<Input>, resetKey?: unknown) {
  const submit = useSubmit();
  const form = useForm<Input, unknown, Output>({ resolver: zodResolver(schema), defaultValues, mode: "onTouched" });
  // A new saved revision (resetKey) replaces what the form holds, including its base revision. Not
  // on the first render: the form already starts from those values, and what was typed into the
  // server-rendered page before its scripts ran must be kept (react-hook-form keeps it).
  const shownKey = useRef(resetKey);
  useEffect(() => {
    if (resetKey === undefined || shownKey.current === resetKey) return;
    shownKey.current = resetKey;
    form.reset(defaultValues);
  }, [resetKey]);
  const onSubmit = form.handleSubmit((_values, event) => {
    const el = (event?.target ?? null) as HTMLFormElement | null;
    if (el) submit(el, { method: "post" });
  });
  return { form, onSubmit };
}

/** Messages for one field: the browser's check first, then what the server said. */
export function errorsFor(form: { formState: { errors: Record<string, { message?: unknown } | undefined> } }, server: Record<string, string[] | undefined> | undefined, name: string) {
  const client = form.formState.errors[name]?.message;
  // Server messages about list entries ("altitudes.2") belong to the list's field.
  const fromServer = Object.entries(server ?? {})
    .filter(([key]) => key === name || key.startsWith(`${name}.`))
    .flatMap(([, messages]) => messages ?? []);
  return [typeof client === "string" ? client : undefined, ...fromServer];
}
