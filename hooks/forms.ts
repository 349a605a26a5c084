import type { z } from 'zod';
import { fieldPath } from '../shared/fieldPath';
import { ApiClientError } from './api';

/** Pre-validates a form with the shared zod schema: field → first message. */
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
