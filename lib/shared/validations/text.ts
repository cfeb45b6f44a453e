import { z } from 'zod';
import '@/lib/shared/validations/error-map';

// Text people type that the app stores and shows again. Two kinds of character are refused rather
// than stored: a lone UTF-16 surrogate (half of a character, which no database column can hold, so
// the driver would swap it for a replacement sign) and control characters (invisible, and in a
// one-line name a line break or a tab only ever comes from a paste gone wrong). Refusing with the
// field named lets the person fix the text; silently storing something else would not.

const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
// Unicode category Cc: C0 controls, DEL and C1 controls.
const CONTROL = /[\u0000-\u001F\u007F-\u009F]/;
// The same, except tab, line feed and carriage return, which multi-line text may hold.
const CONTROL_EXCEPT_LINES = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F-\u009F]/;

const SURROGATE_MESSAGE = 'contains a broken character (half of an emoji or other symbol); retype it.';

/** True when `text` holds a lone surrogate (a UTF-16 code unit that is half of a character). */
export function hasLoneSurrogate(text: string): boolean {
  return LONE_SURROGATE.test(text);
}

/** True when `text` holds a control character (Unicode category Cc); `lines` allows tab, CR and LF. */
export function hasControlCharacter(text: string, options: { lines?: boolean } = {}): boolean {
  return (options.lines ? CONTROL_EXCEPT_LINES : CONTROL).test(text);
}

/**
 * A one-line name (a person, a study, a design, a key): trimmed, `min`..`max` characters, no lone
 * surrogates and no control characters. Every name field of every schema is built with this, so
 * the rule and its messages are the same everywhere. `label` starts the messages ("The name").
 */
export function nameText(options: { label: string; min: number; max: number; tooShort?: string; tooLong?: string }) {
  const { label, min, max } = options;
  return z
    .string({ error: `${label} must be text.` })
    .refine((s) => !hasLoneSurrogate(s), { message: `${label} ${SURROGATE_MESSAGE}`, abort: true })
    .refine((s) => !hasControlCharacter(s), { message: `${label} contains a control character (such as a line break or a tab); remove it.`, abort: true })
    .trim()
    .min(min, options.tooShort ?? (min <= 1 ? `${label} is required.` : `${label} needs at least ${min} characters.`))
    .max(max, options.tooLong ?? `${label} must be at most ${max} characters.`);
}

/**
 * Free multi-line text (a description, notes, a comment): at most `max` characters, line breaks and
 * tabs allowed, other control characters and lone surrogates refused.
 */
export function freeText(options: { label: string; max: number; tooLong?: string; trim?: boolean }) {
  const { label, max } = options;
  const base = z
    .string({ error: `${label} must be text.` })
    .refine((s) => !hasLoneSurrogate(s), { message: `${label} ${SURROGATE_MESSAGE}`, abort: true })
    .refine((s) => !hasControlCharacter(s, { lines: true }), { message: `${label} contains a control character; remove it.`, abort: true });
  return (options.trim === false ? base : base.trim()).max(max, options.tooLong ?? `${label} must be at most ${max} characters.`);
}
