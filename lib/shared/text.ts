import { z } from "zod";

/**
 * Control characters other than tab, newline and carriage return (C0 and DEL). PostgreSQL refuses NUL in text and
 * jsonb, and the others have no place in a title, a note or a name; a browser's textarea sends newlines as CR LF.
 */
export const CONTROL_CHARACTERS = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;

export function hasControlCharacters(s: string): boolean {
  return CONTROL_CHARACTERS.test(s);
}

/** The message naming the field whose text holds a control character. */
export function controlCharacterMessage(field: string): string {
  return `${field}: control characters (such as NUL) are not allowed; tab and newline are fine`;
}

/**
 * Free text that is stored: a string refusing control characters, with the field named in the message. Chain the
 * usual `.trim().min().max()` on the result.
 */
export function storedText(field: string): z.ZodString {
  return z.string().refine((s) => !hasControlCharacters(s), controlCharacterMessage(field)) as unknown as z.ZodString;
}
