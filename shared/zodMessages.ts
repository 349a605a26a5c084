/**
 * The words of a schema check that fails, as the user reads them: a sentence about their data ("Enter a number
 * greater than 0"), never the library's wording ("Too small: expected number to be >0"). Installed once for zod as a
 * whole (`z.config({ customError })`) by the schema modules, so the server's 4xx field messages, the model's issues
 * (`parseModel`) and the app's forms say the same thing. A check with its own message (`ctx.addIssue({ message })`,
 * `.refine(…, 'message')`) keeps it; this only words the checks that have none.
 *
 * Where the failing schema has a `.describe()`, its first words name the field ("Enclosure height: enter a number
 * greater than 0").
 */
import { z } from 'zod';

type RawIssue = z.core.$ZodRawIssue;

/** "Enclosure height, mm" → "Enclosure height"; descriptions that do not start with a name give nothing. */
export function fieldWords(description: string | undefined): string | undefined {
  if (!description) return undefined;
  const head = description.split(/[,;:(]/)[0]!.trim();
  if (head.length < 3 || head.length > 48) return undefined;
  if (/^(omitted|true|false|null|optional|the |a |an |one of|give |when |if )/i.test(head)) return undefined;
  return head;
}

function num(v: unknown): string {
  if (typeof v === 'bigint') return v.toString();
  if (typeof v === 'number')
    return Number.isFinite(v) ? v.toLocaleString('en-US', { maximumFractionDigits: 6 }) : String(v);
  if (v instanceof Date) return v.toISOString().slice(0, 10);
  return String(v);
}

function plural(n: unknown, one: string, many: string): string {
  return Number(n) === 1 ? one : many;
}

function kindOf(expected: string): string {
  switch (expected) {
    case 'number':
    case 'nan':
      return 'Enter a number';
    case 'int':
    case 'bigint':
      return 'Enter a whole number';
    case 'string':
      return 'Enter text';
    case 'boolean':
      return 'Choose yes or no';
    case 'array':
    case 'tuple':
    case 'set':
      return 'Give a list of values';
    case 'object':
    case 'record':
    case 'map':
      return 'Give the details of this item';
    case 'date':
      return 'Enter a date';
    default:
      return 'Enter a value of the right kind';
  }
}

/** The sentence for one failed check (without the field's words). */
export function sentenceOf(iss: RawIssue): string | undefined {
  const i = iss as RawIssue & Record<string, unknown>;
  switch (iss.code) {
    case 'invalid_type': {
      if (i.input === undefined) return 'This value is required';
      if (i.input === null) return 'This value cannot be empty';
      return kindOf(String(i.expected));
    }
    case 'too_small': {
      const inclusive = i.inclusive !== false;
      const min = i.minimum;
      switch (i.origin) {
        case 'string':
          return Number(min) <= 1 ? 'This cannot be empty' : `Enter at least ${num(min)} characters`;
        case 'array':
        case 'set':
          return `Give at least ${num(min)} ${plural(min, 'item', 'items')}`;
        case 'date':
          return `Enter a date on or after ${num(min)}`;
        default:
          return inclusive ? `Enter a number of at least ${num(min)}` : `Enter a number greater than ${num(min)}`;
      }
    }
    case 'too_big': {
      const inclusive = i.inclusive !== false;
      const max = i.maximum;
      switch (i.origin) {
        case 'string':
          return `Enter at most ${num(max)} characters`;
        case 'array':
        case 'set':
          return `Give at most ${num(max)} ${plural(max, 'item', 'items')}`;
        case 'date':
          return `Enter a date on or before ${num(max)}`;
        default:
          return inclusive ? `Enter a number of at most ${num(max)}` : `Enter a number less than ${num(max)}`;
      }
    }
    case 'not_multiple_of':
      return `Enter a multiple of ${num(i.divisor)}`;
    case 'invalid_value': {
      const values = Array.isArray(i.values) ? (i.values as unknown[]) : [];
      if (values.length === 1) return `Enter ${JSON.stringify(values[0])}`;
      return `Choose one of: ${values.map((v) => (typeof v === 'string' ? v : JSON.stringify(v))).join(', ')}`;
    }
    case 'invalid_format': {
      const format = String(i.format);
      if (format === 'email') return 'Enter an email address such as name@example.com';
      if (format === 'url') return 'Enter a web address starting with https://';
      if (format === 'regex') return 'This value contains characters that are not accepted here';
      if (format === 'starts_with') return `Start this value with "${String(i.prefix)}"`;
      if (format === 'ends_with') return `End this value with "${String(i.suffix)}"`;
      if (format === 'includes') return `Include "${String(i.includes)}" in this value`;
      if (/date|time/.test(format)) return 'Enter a date such as 2026-05-31';
      return 'This value is not written in a form that is accepted here';
    }
    case 'unrecognized_keys': {
      const keys = Array.isArray(i.keys) ? (i.keys as string[]) : [];
      return `Remove the unknown ${plural(keys.length, 'field', 'fields')} ${keys.map((k) => `"${k}"`).join(', ')}`;
    }
    case 'invalid_union':
      return 'This value matches none of the accepted forms';
    case 'invalid_key':
      return 'This list has a name that is not accepted';
    case 'invalid_element':
      return 'This list has a value that is not accepted';
    default:
      return undefined;
  }
}

/** The error map: the field's words (from its description) and the sentence. */
export function userMessage(iss: RawIssue): string | undefined {
  const sentence = sentenceOf(iss);
  if (sentence === undefined) return undefined;
  const i = iss as RawIssue & { schema?: { description?: string }; inst?: { description?: string } };
  const words = iss.code === 'unrecognized_keys' ? undefined : fieldWords(i.schema?.description ?? i.inst?.description);
  return words ? `${words}: ${sentence.charAt(0).toLowerCase()}${sentence.slice(1)}` : sentence;
}

z.config({ customError: userMessage });
