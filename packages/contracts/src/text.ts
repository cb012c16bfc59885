/**
 * What text fields may hold. A one-line field (a name, a tag, a title) holds no control
 * characters at all: a line break in a machine name would forge a line of its own in a
 * plain-text alert e-mail, a log line or a CSV export. Free text (notes, reasons) keeps
 * tab and line breaks but nothing else below U+0020. Both refuse the C1 controls and the
 * Unicode line and paragraph separators, which some readers also take as line breaks.
 *
 * Sources: Unicode 15.0 §5.8 "Newline Guidelines" (NEL U+0085, LS U+2028, PS U+2029 as line
 * ends) and the C0/C1 control code sets of ISO/IEC 6429.
 */
import { z } from 'zod';

// eslint-disable-next-line no-control-regex
const ANY_CONTROL = /[\u0000-\u001f\u007f-\u009f\u2028\u2029]/;
// eslint-disable-next-line no-control-regex
const CONTROL_BUT_LINE_BREAKS = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f\u2028\u2029]/;

export const ONE_LINE_MESSAGE = 'Use one line of text: no line breaks, tabs or control characters.';
export const FREE_TEXT_MESSAGE =
  'Remove the control characters (only line breaks and tabs are kept).';

/** True when `s` holds no control character (one-line fields). */
export const isOneLine = (s: string) => !ANY_CONTROL.test(s);

/** A one-line field: `schema` plus the refusal of every control character. */
export function oneLine<T extends z.ZodString>(schema: T): T {
  return schema.refine(isOneLine, ONE_LINE_MESSAGE) as T;
}

/** Free text (notes, reasons): `schema` plus the refusal of controls other than tab, CR, LF. */
export function freeText<T extends z.ZodString>(schema: T): T {
  return schema.refine((s) => !CONTROL_BUT_LINE_BREAKS.test(s), FREE_TEXT_MESSAGE) as T;
}
