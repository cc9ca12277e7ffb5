// Building blocks of the form and API schemas that keep bad text and numbers out
// (docs/input-limits.md): text must be well-formed Unicode (no lone surrogate, which MariaDB's
// JSON check refuses) and, for names, free of control characters; numbers come from the API
// as JSON numbers only (null, "" and true are not 0, 0 and 1), and from page forms as text that
// `decodeForm` (shared/form-decode.ts) reads, an empty field staying empty so the "required"
// message shows.
import { z } from "zod";

/** A lone UTF-16 surrogate: text that cannot be written as UTF-8 or JSON. */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
// C0 and C1 control characters; tab, line feed and carriage return are allowed in multi-line text.
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u001f\u007f-\u009f]/;
// eslint-disable-next-line no-control-regex
const CONTROL_EXCEPT_LINES = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;

export const isWellFormed = (text: string) => !LONE_SURROGATE.test(text);

const WELL_FORMED_MESSAGE = "Contains a character that is not valid Unicode text (a lone surrogate).";

/** One line of text: a name. Trimmed, 1 to `max` characters, no control characters. */
export function nameField(requiredMessage: string, max = 200, tooLongMessage = `Keep it under ${max} characters.`) {
  return z
    .string({ error: requiredMessage })
    .trim()
    .min(1, requiredMessage)
    .max(max, tooLongMessage)
    .refine(isWellFormed, WELL_FORMED_MESSAGE)
    .refine((v) => !CONTROL.test(v), "Contains a control character; use plain text on one line.");
}

/** Free text over several lines (notes, justifications): at most `max` characters, well-formed. */
export function textField(max: number, tooLongMessage = `Keep it under ${max.toLocaleString("en")} characters.`) {
  return z
    .string({ error: "Must be text." })
    .trim()
    .max(max, tooLongMessage)
    .refine(isWellFormed, WELL_FORMED_MESSAGE)
    .refine((v) => !CONTROL_EXCEPT_LINES.test(v), "Contains a control character.");
}

/** A positive whole-number id from a form or a path ("abc", "1.5" and "-3" are refused). */
export const idField = (message: string) =>
  z
    .union([z.number(), z.string().trim().regex(/^\d{1,15}$/, message)], { error: message })
    .transform((v) => Number(v))
    .pipe(z.number().int(message).positive(message));
