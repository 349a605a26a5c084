import { z } from 'zod';

/**
 * Characters refused in names: C0 and C1 control characters (NUL, tab, line breaks, escape…), DEL, and the
 * invisible text-direction controls (LRM/RLM, embeddings, overrides and isolates) that can make a printed name
 * read differently from what is stored.
 */
export const NAME_FORBIDDEN = /[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/;

export const NAME_FORBIDDEN_MESSAGE =
  'Remove control characters (such as NUL or line breaks) and text-direction overrides: they do not print';

/** True when a name has nothing that cannot print. Accents, Greek, CJK and other scripts are fine. */
export function isPrintableName(value: string): boolean {
  return !NAME_FORBIDDEN.test(value);
}

/** A name field: the given string schema, refusing control characters and direction overrides with a clear message. */
export function printableName<S extends z.ZodType<string | undefined>>(schema: S): S {
  return schema.refine((v) => v === undefined || isPrintableName(v), { message: NAME_FORBIDDEN_MESSAGE }) as S;
}
