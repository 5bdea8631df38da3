// The one schema for text a person types or a client sends, shared by every form and API (browser and server).
// Hostile text must end as a 4xx with a message at the field, never as a 500 from PostgreSQL (which refuses
// NUL) or from a renderer (which chokes on lone surrogates), and never as a name nobody can see.
import { z } from "zod";

export type TextOptions = {
  /** What the field is, as the person reads it: "make", "town or city". Used in the default messages. */
  label: string;
  /** Most characters (UTF-16 units) after trimming. Every text has one. */
  max: number;
  /** Fewest characters after trimming; 0 (the default) lets an empty string through. */
  min?: number;
  /** Allows line breaks and tabs (descriptions, notes, messages); one-line fields refuse them. */
  multiline?: boolean;
  /** Messages that say more than the defaults: when the field is missing or too short, when too long. */
  messages?: { missing?: string; tooShort?: string; tooLong?: string };
};

// C0 and C1 control characters and DEL; a multi-line text keeps tab, line feed and carriage return.
const CONTROL = /[\u0000-\u001F\u007F-\u009F]/;
const CONTROL_EXCEPT_LINES = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/;
// A high surrogate not followed by a low one, or a low one without a high one before it.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
// Characters that show nothing: white space, default-ignorables (zero-width, bidi and other format
// characters, Hangul fillers, variation selectors), combining marks with no base, the blank braille cell.
const INVISIBLE_ONLY = /^[\p{White_Space}\p{Default_Ignorable_Code_Point}\p{Mn}\p{Me}\u2800]*$/u;

/** True when the text holds a character no form field should carry: a control character or a lone surrogate. */
export function hasHostileCharacters(value: string, options: { multiline?: boolean } = {}): boolean {
  return LONE_SURROGATE.test(value) || (options.multiline ? CONTROL_EXCEPT_LINES : CONTROL).test(value);
}

/** True when nothing in the text would be visible on a page (empty, spaces, zero-width or format characters). */
export function isInvisible(value: string): boolean {
  return INVISIBLE_ONLY.test(value);
}

/**
 * Text a person typed: trimmed, refused if it holds a lone surrogate or a control character (tab and line
 * breaks allowed only when `multiline`), NFC-normalised, then held to `min`/`max`. A zod string schema, so
 * callers may add `.optional()`, `.default("")` or a `.regex()`.
 */
export function safeText({ label, max, min = 0, multiline = false, messages = {} }: TextOptions) {
  const missing = messages.missing ?? `Enter the ${label}.`;
  return z
    .string({ error: missing })
    .trim()
    .refine((value) => !LONE_SURROGATE.test(value), { error: `The ${label} holds a broken character; type it again.`, abort: true })
    .refine((value) => !(multiline ? CONTROL_EXCEPT_LINES : CONTROL).test(value), {
      error: multiline ? `The ${label} holds a control character (such as NUL); remove it.` : `Keep the ${label} to one line, without control characters (such as NUL).`,
      abort: true,
    })
    .normalize("NFC")
    .min(min, { error: messages.tooShort ?? (min <= 1 ? missing : `Enter at least ${min} characters for the ${label}.`), abort: true })
    .max(max, { error: messages.tooLong ?? `Keep the ${label} to ${max} characters.` });
}

/**
 * A name or title: `safeText` that also refuses text made only of invisible characters (zero-width spaces,
 * format characters, fillers), so every name can be seen and told apart. At least one character by default.
 */
export function safeName(options: TextOptions) {
  const { label, min = 1 } = options;
  return safeText({ ...options, min }).refine((value) => !isInvisible(value), { error: `The ${label} must have letters or digits one can see.` });
}

/** An id sent back by a form (a slot, a photo, a saved search): a UUID, with a message instead of a database error. */
export function formId(label: string) {
  return z.uuid({ error: `Choose a ${label} from the list.` });
}

/**
 * An amount typed in decimal digits ("18500", "18500.50", "18500,50", "-4"), as a number. Refuses what
 * `Number()` would read too kindly: hex ("0x10"), exponents ("1e3"), "+", spaces inside, "Infinity". A minus
 * passes so that the caller's range can say what is allowed.
 */
export function decimalAmount({ label, decimals = 2, messages = {} }: { label: string; decimals?: number; messages?: { missing?: string; invalid?: string } }) {
  const pattern = decimals > 0 ? new RegExp(`^-?\\d{1,12}([.,]\\d{1,${decimals}})?$`) : /^-?\d{1,12}$/;
  const invalid = messages.invalid ?? `Enter the ${label} in digits${decimals > 0 ? `, with at most ${decimals} decimals` : ""}, e.g. 18500.`;
  return z
    .string({ error: messages.missing ?? `Enter the ${label}.` })
    .trim()
    .min(1, { error: messages.missing ?? `Enter the ${label}.`, abort: true })
    .regex(pattern, { error: invalid })
    .transform((value) => Number(value.replace(",", ".")));
}

/** A file's size in bytes as a browser reports it before an upload: whole, and more than nothing. */
export function fileSize() {
  return decimalAmount({ label: "file size", decimals: 0 }).pipe(z.number().positive({ error: "The file is empty: choose a file with something in it." }));
}
