import { zodResolver } from "@hookform/resolvers/zod";
import { useEffect, useLayoutEffect, useMemo, useRef, useState } from "react";
import { createFormControl, get, type DefaultValues, type FieldValues, type FormState, type Path, type PathValue, type Resolver, type UseFormProps, type UseFormRegister, type UseFormReturn } from "react-hook-form";
import { useSubmit } from "react-router";
import type { z } from "zod";

/** The react-hook-form state of a form checked by a zod schema: what is typed in, and what the schema makes of it. */
export type ZodForm<S extends z.ZodType<FieldValues, FieldValues>> = UseFormReturn<z.input<S>, unknown, z.output<S>>;

/**
 * react-hook-form with the route's zod schema. The form still posts as an ordinary HTML form (so it
 * works before JavaScript loads); with JavaScript the same schema checks it first and the post goes
 * through React Router's submit, and the action re-validates with that schema.
 *
 * The schema may be given as a function that imports it: the page then answers its first click
 * without zod and the step schemas (some 100 KB of script to evaluate), which load once something on
 * the page takes the focus (a field about to be typed into and checked on blur, a button about to
 * submit), or at the form's first check if that comes sooner. Not when the browser is first idle: a
 * click sent then waited for the schemas' evaluation, and a page only read never needs them.
 */
export function useZodForm<Output extends FieldValues, Input extends FieldValues>(schema: z.ZodType<Output, Input> | (() => Promise<z.ZodType<Output, Input>>), defaultValues?: DefaultValues<Input>, resetKey?: unknown) {
  const submit = useSubmit();
  const [{ resolver, preload }] = useState(() => resolverOf(schema));
  const form = useFormRenderedOnce<Input, Output>({ resolver, defaultValues, mode: "onTouched" });
  useEffect(() => (preload ? whenFocused(preload) : undefined), [preload]);
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
 * react-hook-form's useForm, less the second render it makes of the whole form as the page hydrates.
 * useForm (7.92) marks the form ready with a state update in a layout effect: every page with a form
 * rendered it, its panels and grids twice in the hydrating task, before the page could answer a click.
 * This is the same form control (createFormControl), subscribed to its form state as useForm
 * subscribes (a state change that the rendering has read, or a watched value, renders the form
 * again), with useForm's effects for the options used here (resolver, default values, mode), and the
 * ready flag set without a render: nothing rendered reads it.
 */
/* eslint-disable react-hooks/immutability -- the form control is react-hook-form's store, kept once per
   form and changed by its own methods, which useForm's effects set as these do. */
function useFormRenderedOnce<Input extends FieldValues, Output>(props: UseFormProps<Input, unknown, Output>): UseFormReturn<Input, unknown, Output> {
  const [methods] = useState(() => {
    const { formControl: _, ...rest } = createFormControl<Input, unknown, Output>(props);
    return rest as UseFormReturn<Input, unknown, Output>;
  });
  const { control } = methods;
  const [formState, setFormState] = useState(() => formStateOf(control));
  useLayoutEffect(() => {
    const unsubscribe = control._subscribe({ formState: control._proxyFormState, callback: () => setFormState(formStateOf(control)), reRenderRoot: true });
    control._formState.isReady = true;
    control._subjects.state.next({ isReady: true });
    return unsubscribe;
  }, [control]);
  // As useForm: a form made dirty before the subscription above (what was typed before the scripts
  // ran, given back in the first commit's ref callbacks) says so once subscribed.
  useEffect(() => {
    if (!control._proxyFormState.isDirty) return;
    const isDirty = control._getDirty();
    if (isDirty !== formState.isDirty) control._subjects.state.next({ isDirty });
  }, [control, formState.isDirty]);
  // As useForm, after every commit: the form counts as mounted (values read from what is typed, not
  // the defaults), a watched field registered meanwhile is announced, removed fields are let go.
  useEffect(() => {
    if (!control._state.mount) {
      control._setValid();
      control._state.mount = true;
    }
    if (control._state.watch) {
      control._state.watch = false;
      control._subjects.state.next({ ...control._formState });
    }
    control._removeUnmounted();
  });
  // The form state handed to rendering notes what it reads, so only those changes render again.
  methods.formState = useMemo(() => trackedFormState(formState, control._proxyFormState), [control, formState]);
  return methods;
}
/* eslint-enable react-hooks/immutability */

function formStateOf<T extends FieldValues>(control: UseFormReturn<T, unknown, unknown>["control"]): FormState<T> {
  return { ...control._formState, defaultValues: control._defaultValues as FormState<T>["defaultValues"] };
}

/** useForm's form state as the form renders it: reading a property subscribes the form to its changes. */
function trackedFormState<T extends FieldValues>(formState: FormState<T>, read: Record<string, unknown>): FormState<T> {
  const result = {} as FormState<T>;
  for (const key of Object.keys(formState) as (keyof FormState<T> & string)[]) {
    Object.defineProperty(result, key, {
      get: () => {
        if (read[key] !== "all") read[key] = "all";
        return formState[key];
      },
    });
  }
  return result;
}

/** Calls `run` once, when something on the page first takes the focus; returns the cancel. */
function whenFocused(run: () => void): () => void {
  const once = () => {
    document.removeEventListener("focusin", once);
    run();
  };
  document.addEventListener("focusin", once);
  return () => document.removeEventListener("focusin", once);
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
