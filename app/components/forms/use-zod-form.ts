import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useRef, useState } from "react";
import { get, useForm, type DefaultValues, type FieldValues, type Path, type PathValue, type Resolver, type UseFormRegister, type UseFormReturn } from "react-hook-form";
import { useSubmit } from "react-router";
import type { z } from "zod";
import { whenIdle } from "~/components/ui/use-after-interactive";

/** The react-hook-form state of a form checked by a zod schema: what is typed in, and what the schema makes of it. */
export type ZodForm<S extends z.ZodType<FieldValues, FieldValues>> = UseFormReturn<z.input<S>, unknown, z.output<S>>;

/**
 * react-hook-form with the route's zod schema. The form still posts as an ordinary HTML form (so it
 * works before JavaScript loads); with JavaScript the same schema checks it first and the post goes
 * through React Router's submit, and the action re-validates with that schema.
 *
 * The schema may be given as a function that imports it: the page then answers its first click
 * without zod and the step schemas (some 100 KB of script to evaluate), which load once the browser
 * is idle after hydration, or at the form's first check if that comes sooner.
 */
export function useZodForm<Output extends FieldValues, Input extends FieldValues>(schema: z.ZodType<Output, Input> | (() => Promise<z.ZodType<Output, Input>>), defaultValues?: DefaultValues<Input>, resetKey?: unknown) {
  const submit = useSubmit();
  const [{ resolver, preload }] = useState(() => resolverOf(schema));
  const form = useForm<Input, unknown, Output>({ resolver, defaultValues, mode: "onTouched" });
  useEffect(() => (preload ? whenIdle(preload) : undefined), [preload]);
  // True until the first commit: the ref callbacks of that commit meet the server-rendered inputs.
  const hydrating = useRef(true);
  useEffect(() => {
    hydrating.current = false;
  }, []);
  const patched = useRef(false);
  /* eslint-disable react-hooks/refs, react-hooks/immutability -- register is wrapped once per form
     instance in its first render, so the fields registered in that same render go through it; the
     hydrating ref is read later, in the fields' ref callbacks, not while rendering. */
  if (!patched.current) {
    // Every field of every form (panels and grid cells alike) registers through this one place.
    form.register = registerKeepingTyped(form, form.register, hydrating);
    patched.current = true;
  }
  /* eslint-enable react-hooks/refs, react-hooks/immutability */
  // A new saved revision (resetKey) replaces what the form holds, including its base revision. Not
  // on the first render: the form already starts from those values. Forms are disabled from the
  // post until the page holds the new revision (useSaving), so nothing typed is replaced here.
  const shownKey = useRef(resetKey);
  const { reset } = form;
  useEffect(() => {
    if (resetKey === undefined || shownKey.current === resetKey) return;
    shownKey.current = resetKey;
    reset(defaultValues);
  }, [resetKey, reset, defaultValues]);
  const onSubmit = form.handleSubmit((_values, event) => {
    const el = (event?.target ?? null) as HTMLFormElement | null;
    if (el) submit(formBody(el, form.getValues()), { method: "post", action: el.getAttribute("action") ?? undefined, encType: el.enctype as "application/x-www-form-urlencoded" | "multipart/form-data" });
  });
  return { form, onSubmit };
}

/**
 * The resolver of a schema given as it is, or as a function that imports it (then loaded once, on
 * first use or `preload`; a failed load is tried again at the next check). A schema that cannot be
 * loaded (the connection dropped, a newer version of the app deployed) checks nothing in the
 * browser: the form posts what was typed, and the action checks it with the same schema.
 */
function resolverOf<Output extends FieldValues, Input extends FieldValues>(schema: z.ZodType<Output, Input> | (() => Promise<z.ZodType<Output, Input>>)): { resolver: Resolver<Input, unknown, Output>; preload?: () => void } {
  if (typeof schema !== "function") return { resolver: zodResolver(schema) };
  let loaded: Promise<Resolver<Input, unknown, Output>> | undefined;
  const load = () =>
    (loaded ??= schema().then(
      (s) => zodResolver(s),
      (error: unknown) => {
        loaded = undefined;
        throw error;
      },
    ));
  const resolver: Resolver<Input, unknown, Output> = async (values, context, options) => {
    let check: Resolver<Input, unknown, Output>;
    try {
      check = await load();
    } catch {
      // The form's posted body is built from its controls (formBody), not from these values.
      return { values: values as unknown as Output, errors: {} };
    }
    return check(values, context, options);
  };
  return { resolver, preload: () => void load().catch(() => undefined) };
}

/**
 * What the form posts: its controls, and the rows of a windowed grid (EditableGrid) that are not on
 * screen, from the form's state, under the names their inputs would have ("cases.120.mach"). A row
 * with any control in the form is posted by its controls alone, as a browser posts it.
 */
export function formBody(el: HTMLFormElement, values: FieldValues): FormData {
  const body = new FormData(el);
  for (const [list, rows] of Object.entries(values)) {
    if (!Array.isArray(rows)) continue;
    rows.forEach((row: unknown, i) => {
      if (row === null || typeof row !== "object" || Array.isArray(row)) return;
      const cells = Object.entries(row as Record<string, unknown>);
      if (cells.some(([key]) => el.elements.namedItem(`${list}.${i}.${key}`) !== null)) return;
      for (const [key, v] of cells) if (typeof v === "string" || typeof v === "number" || typeof v === "boolean") body.append(`${list}.${i}.${key}`, String(v));
    });
  }
  return body;
}

type Control = HTMLInputElement | HTMLSelectElement | HTMLTextAreaElement;

/** The value a server-rendered control had before anyone typed into it. */
function renderedValue(el: Control): string | boolean {
  if (el instanceof HTMLSelectElement) return [...el.options].find((o) => o.defaultSelected)?.value ?? el.options[0]?.value ?? "";
  if (el instanceof HTMLInputElement && (el.type === "checkbox" || el.type === "radio")) return el.defaultChecked;
  return el.defaultValue;
}

function currentValue(el: Control): string | boolean {
  return el instanceof HTMLInputElement && (el.type === "checkbox" || el.type === "radio") ? el.checked : el.value;
}

/**
 * react-hook-form's register, with two changes that keep what a person typed:
 * - the control carries its saved value as defaultValue/defaultChecked, so the server-rendered page
 *   shows the saved values before its scripts run (react-hook-form alone fills inputs from scripts);
 * - when the scripts start, react-hook-form writes the saved value into each control it registers,
 *   over anything typed into the page before then; a control whose value differs from what the
 *   server rendered gets what was typed back, marked as a change.
 */
function registerKeepingTyped<T extends FieldValues, O>(form: UseFormReturn<T, unknown, O>, register: UseFormRegister<T>, hydrating: { current: boolean }): UseFormRegister<T> {
  return (name, options) => {
    const field = register(name, options);
    // What the form holds now: the saved value when the page is first drawn, what was typed when a
    // windowed grid draws a row again (a checkbox drawn with a stale defaultChecked would be read back).
    const saved: unknown = get(form.control._formValues, name);
    const initial = typeof saved === "boolean" ? { defaultChecked: saved } : typeof saved === "number" || typeof saved === "string" ? { defaultValue: String(saved) } : {};
    return {
      ...field,
      ...initial,
      ref: (el: Control | null) => {
        const typed = el && hydrating.current ? currentValue(el) : undefined;
        const changed = el !== null && typed !== undefined && typed !== renderedValue(el);
        field.ref(el);
        if (changed) form.setValue(name as Path<T>, typed as PathValue<T, Path<T>>, { shouldDirty: true });
      },
    };
  };
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
