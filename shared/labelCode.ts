/**
 * Label codes: 16 characters of Crockford base32 (no I, L, O, U), printed in groups of four under the QR code.
 * The one parser for everything that reads a code — the scan screen, the public check, the field routes, the PDF.
 */

/** Crockford base32: no I, L, O, U, so a code read aloud or typed from a label is unambiguous. */
export const LABEL_CODE_ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
export const LABEL_CODE_LENGTH = 16;

/**
 * A code as typed or read, normalized: upper case, without spaces, dashes and other separators, with the usual
 * misreadings of the alphabet mapped back (O → 0, I and L → 1).
 */
export function normalizeLabelCode(raw: string): string {
  return raw
    .toUpperCase()
    .replace(/[\s\u00a0\u2010-\u2015_.·-]/g, '')
    .replace(/O/g, '0')
    .replace(/[IL]/g, '1');
}

/** True for a well-formed normalized code. */
export function isLabelCode(code: string): boolean {
  return code.length === LABEL_CODE_LENGTH && [...code].every((ch) => LABEL_CODE_ALPHABET.includes(ch));
}

/**
 * The label code in a scanned or typed text: the end of a check address (`…/l/<code>`) or the code itself as
 * printed ("7K3M 9QXW 2R4T BH6N", lower case, dashes, O/I/L look-alikes). Null when it is not a well-formed code.
 */
export function parseLabelCode(text: string): string | null {
  const t = text.trim();
  const url = /\/l\/([^/?#]+)\/?(?:[?#].*)?$/.exec(t);
  let raw = t;
  if (url) {
    try {
      raw = decodeURIComponent(url[1]);
    } catch {
      raw = url[1];
    }
  }
  const code = normalizeLabelCode(raw);
  return isLabelCode(code) ? code : null;
}

/** The code in groups of four for reading aloud or typing: "7K3M 9QXW 2R4T BH6N". */
export function groupLabelCode(code: string): string {
  return code.replace(/(.{4})(?=.)/g, '$1 ');
}
