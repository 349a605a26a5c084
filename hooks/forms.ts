import { zodResolver } from '@hookform/resolvers/zod';
import {
  useForm,
  type DefaultValues,
  type FieldError,
  type FieldErrors,
  type FieldValues,
  type Path,
  type Resolver,
  type UseFormReturn,
} from 'react-hook-form';
import type { z } from 'zod';
import { fieldPath } from '../shared/fieldPath';
import { ApiClientError } from './api';

/** Pre-validates a value with the shared zod schema: field → first message (for checks outside a form). */
export function validate<S extends z.ZodType>(
  schema: S,
  value: unknown,
): { ok: true; data: z.infer<S> } | { ok: false; errors: Record<string, string> } {
  const r = schema.safeParse(value);
  if (r.success) return { ok: true, data: r.data };
  const errors: Record<string, string> = {};
  for (const issue of r.error.issues) {
    const key = fieldPath(issue.path);
    errors[key] ??= issue.message;
  }
  return { ok: false, errors };
}

/** Field errors and a message from a server error, to show beside the fields. */
export function serverErrors(e: unknown): { message: string; fields: Record<string, string> } {
  if (e instanceof ApiClientError) return { message: e.message, fields: e.fields ?? {} };
  return { message: e instanceof Error ? e.message : 'Something went wrong', fields: {} };
}

/** A form whose fields hold `F` and whose submit handler gets the schema's output. */
export type ZodForm<F extends FieldValues, S extends z.ZodType> = UseFormReturn<F, unknown, z.output<S>>;

/**
 * A form checked with a shared zod schema (react-hook-form with the zod resolver). The fields hold what the user
 * entered (`F`; by default the schema's input, but e.g. text where the schema takes a number, or `false` where it
 * takes `true`) and `toInput` turns them into what the schema checks; the field names are the schema's paths, so each
 * message lands under its field. The check
 * runs on submit and a message stays until the next submit (or the field's `clearErrors`), as a server's does.
 */
export function useZodForm<S extends z.ZodType, F extends FieldValues = z.input<S> & FieldValues>(
  schema: S,
  options: {
    defaultValues: DefaultValues<F>;
    /** The stored values the form follows when they change (e.g. after a save or another person's edit). */
    values?: F;
    toInput?: (values: F) => unknown;
    /** Rewords messages where the text entered says more than the schema can (e.g. "12.5" for whole days). */
    reword?: (errors: FieldErrors<F>, values: F) => void;
  },
): ZodForm<F, S> {
  return useForm<F, unknown, z.output<S>>({
    defaultValues: options.defaultValues,
    values: options.values,
    resolver: zodFormResolver<S, F>(schema, options.toInput, options.reword),
    mode: 'onSubmit',
    reValidateMode: 'onSubmit',
    shouldFocusError: false,
  });
}

/** The zod resolver of a form whose fields hold `F`: `toInput` turns them into the schema's input first. */
export function zodFormResolver<S extends z.ZodType, F extends FieldValues = z.input<S> & FieldValues>(
  schema: S,
  toInput?: (values: F) => unknown,
  reword?: (errors: FieldErrors<F>, values: F) => void,
): Resolver<F, unknown, z.output<S>> {
  // The library's resolver is typed by its schema's input; here the fields hold `F`, turned into that input first.
  const check = zodResolver(schema as z.ZodType<z.output<S>, FieldValues>) as unknown as Resolver<
    FieldValues,
    unknown,
    z.output<S>
  >;
  return async (values, context, opts) => {
    const result = await check(
      (toInput ? toInput(values) : values) as FieldValues,
      context,
      opts as Parameters<typeof check>[2],
    );
    if (reword && Object.keys(result.errors).length > 0) reword(result.errors as FieldErrors<F>, values);
    return result as Awaited<ReturnType<Resolver<F, unknown, z.output<S>>>>;
  };
}

/** The form name of a server field key: `ppeLevels[2].name` → `ppeLevels.2.name`. */
export function formFieldName(key: string): string {
  return key.replace(/\[(\d+)\]/g, '.$1');
}

/**
 * Puts a server error's field messages (an ApiError's `fields`, 4xx) under the form's fields and returns its message
 * for the form's notice.
 */
export function applyServerErrors<F extends FieldValues>(
  form: Pick<UseFormReturn<F, unknown, unknown>, 'setError'>,
  e: unknown,
): string {
  const s = serverErrors(e);
  for (const [key, message] of Object.entries(s.fields)) {
    form.setError(formFieldName(key) as Path<F>, { type: 'server', message });
  }
  return s.message;
}

type ErrorNode = FieldError | { [key: string]: ErrorNode | undefined } | ErrorNode[] | undefined;

/**
 * The message of a field's error, or the first message among its parts (a list's items: `emails.2`), or `undefined`.
 * A list's own message (e.g. "in ascending order") is on the list or its `root`.
 */
export function errorMessage(error: unknown): string | undefined {
  const node = error as ErrorNode;
  if (!node || typeof node !== 'object') return undefined;
  const own = (node as FieldError).message;
  if (typeof own === 'string' && own) return own;
  const root = (node as { root?: FieldError }).root?.message;
  if (root) return root;
  for (const [key, child] of Object.entries(node)) {
    if (key === 'ref' || key === 'type' || key === 'types') continue;
    const m = errorMessage(child);
    if (m) return m;
  }
  return undefined;
}

/** A list's own message (not its items'): what `ppeLevels` says of the levels as a whole. */
export function ownErrorMessage(error: unknown): string | undefined {
  const node = error as { message?: unknown; root?: { message?: string } } | undefined;
  if (!node || typeof node !== 'object') return undefined;
  return (typeof node.message === 'string' && node.message) || node.root?.message || undefined;
}
