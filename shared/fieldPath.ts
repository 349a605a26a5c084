/** The name of an input field from a zod issue path: `a.b[2].c`. Server errors and client forms use the same names. */
export function fieldPath(path: readonly PropertyKey[], prefix = ''): string {
  let key = prefix;
  for (const part of path) {
    key += typeof part === 'number' ? `[${part}]` : key ? `.${String(part)}` : String(part);
  }
  return key || '(body)';
}
