import { modelSchema, type Model, type ModelIssue } from '../../shared/schemas/model';
import { findUnknownKeys } from '../../shared/unknownKeys';
import type { ImportError, ParsedModelFile } from './columns';

/** The system model as JSON (docs/MODEL-FORMAT.md): `"format": "emberline-model", "version": 1`. */

/** Pretty-printed JSON of the model (two-space indent, final newline). */
export function exportModelJson(model: Model): string {
  return `${JSON.stringify(model, null, 2)}\n`;
}

/** 1-based line and column of a character offset. */
function lineAndColumn(text: string, offset: number): { line: number; col: number } {
  let line = 1;
  let start = 0;
  for (let i = 0; i < offset && i < text.length; i += 1) {
    if (text[i] === '\n') {
      line += 1;
      start = i + 1;
    }
  }
  return { line, col: offset - start + 1 };
}

class JsonSyntaxError extends Error {
  constructor(
    message: string,
    readonly offset: number,
  ) {
    super(message);
  }
}

/**
 * Finds the first syntax error of a JSON text (RFC 8259) and its offset. Used only after `JSON.parse` has failed,
 * because the engine's own messages do not always say where.
 */
export function findJsonSyntaxError(text: string): { message: string; offset: number } | null {
  let i = 0;
  const fail = (message: string): never => {
    throw new JsonSyntaxError(message, i);
  };
  const describe = () => (i >= text.length ? 'end of text' : `"${text[i]}"`);
  const space = () => {
    while (i < text.length && ' \t\n\r'.includes(text[i])) i += 1;
  };
  const expect = (ch: string, what: string) => {
    if (text[i] !== ch) fail(`Expected ${what}, found ${describe()}`);
    i += 1;
  };
  const string = () => {
    expect('"', 'a double-quoted string');
    while (i < text.length && text[i] !== '"') {
      const c = text.charCodeAt(i);
      if (c < 0x20) fail('Control character in a string (line breaks must be written \\n)');
      if (text[i] === '\\') {
        i += 1;
        if (text[i] === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(text.slice(i + 1, i + 5))) fail('Bad \\u escape: give four hex digits');
          i += 5;
        } else if (i < text.length && '"\\/bfnrt'.includes(text[i])) i += 1;
        else fail(`Bad escape \\${text[i] ?? ''}`);
      } else i += 1;
    }
    if (i >= text.length) fail('Unterminated string');
    i += 1;
  };
  const number = () => {
    const m = /^-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/.exec(text.slice(i));
    if (!m) fail(`Unexpected ${describe()}`);
    i += m![0].length;
  };
  const value = (): void => {
    space();
    const c = text[i];
    if (c === '{') {
      i += 1;
      space();
      if (text[i] === '}') {
        i += 1;
        return;
      }
      for (;;) {
        space();
        if (text[i] !== '"') fail(`Expected a double-quoted property name, found ${describe()}`);
        string();
        space();
        expect(':', '":" after the property name');
        value();
        space();
        if (text[i] === ',') {
          i += 1;
          space();
          if (text[i] === '}') fail('Trailing comma before "}"');
          continue;
        }
        expect('}', '"," or "}" after the property value');
        return;
      }
    }
    if (c === '[') {
      i += 1;
      space();
      if (text[i] === ']') {
        i += 1;
        return;
      }
      for (;;) {
        value();
        space();
        if (text[i] === ',') {
          i += 1;
          space();
          if (text[i] === ']') fail('Trailing comma before "]"');
          continue;
        }
        expect(']', '"," or "]" after the array element');
        return;
      }
    }
    if (c === '"') return string();
    for (const word of ['true', 'false', 'null']) {
      if (text.startsWith(word, i)) {
        i += word.length;
        return;
      }
    }
    if (c === '-' || (c >= '0' && c <= '9')) return number();
    fail(i >= text.length ? 'Unexpected end of text' : `Unexpected ${describe()}`);
  };
  try {
    value();
    space();
    if (i < text.length) fail(`Unexpected ${describe()} after the end of the JSON value`);
    return null;
  } catch (err) {
    if (err instanceof JsonSyntaxError) return { message: err.message, offset: err.offset };
    if (err instanceof RangeError) return null; // nested too deep to scan: fall back to the parser's message
    throw err;
  }
}

/**
 * Reads a JSON model file. A syntax error comes back with its line and column, a key the model does not know with
 * its path (`buses[3].equipment.workingDistanceMM: unknown field — did you mean workingDistanceMm?`); the model
 * checks that follow (`parseModel`) are located by their model path, e.g. `cables[2].toBus`.
 */
export function importModelJson(text: string, fileName = 'model.json'): ParsedModelFile {
  const source = text.replace(/^\uFEFF/, '');
  let input: unknown;
  try {
    input = JSON.parse(source);
  } catch (err) {
    const found = findJsonSyntaxError(source);
    const at = found ? lineAndColumn(source, found.offset) : undefined;
    const message = `JSON syntax error: ${found?.message ?? (err as Error).message}`;
    const where = at ? `${fileName} line ${at.line}, column ${at.col}` : fileName;
    return { ok: false, errors: [{ file: fileName, ...(at ?? {}), where, message }] };
  }
  if (input === null || typeof input !== 'object' || Array.isArray(input)) {
    return {
      ok: false,
      errors: [
        { file: fileName, where: fileName, message: 'Expected a JSON object: { "format": "emberline-model", … }' },
      ],
    };
  }
  // A misspelt key would be dropped by the schema and its default used without a word: refuse it, naming the path.
  const unknownKeys = findUnknownKeys(modelSchema, input);
  if (unknownKeys.length > 0) {
    return {
      ok: false,
      errors: unknownKeys.map((k) => {
        const [collection, index] = k.parts;
        const element =
          typeof index === 'number' ? (input as Record<string, unknown[]>)[collection]?.[index] : undefined;
        const id = (element as { id?: unknown } | undefined)?.id;
        const elementId = typeof id === 'string' ? id : undefined;
        return {
          file: fileName,
          path: k.path,
          ...(elementId !== undefined ? { elementId } : {}),
          where: `${fileName} ${k.path}${elementId !== undefined ? ` (${elementId})` : ''}`,
          message: k.message,
        };
      }),
    };
  }
  const locate = (issue: ModelIssue): ImportError => ({
    file: fileName,
    path: issue.path,
    ...(issue.elementId !== undefined ? { elementId: issue.elementId } : {}),
    where: `${fileName} ${issue.path}${issue.elementId !== undefined ? ` (${issue.elementId})` : ''}`,
    message: issue.message,
  });
  return { ok: true, input, locate };
}
