/**
 * Text that came from a file, made safe to show on a terminal. Control characters (C0, DEL, C1),
 * invisible format characters (bidi overrides, zero-width marks), line and paragraph separators and
 * unpaired surrogates are shown as `\uXXXX` escapes, so a shared file cannot clear, retitle or
 * recolour the user's terminal, or make a name read differently from what it holds.
 * JSON output does not use this: JSON.stringify already escapes control characters exactly.
 */

/** One character that must not reach a terminal raw; multi-line text keeps tab and line feed. */
const unsafeSingleLine = /[\p{Cc}\p{Cf}\p{Zl}\p{Zp}\p{Cs}]/gu;
const unsafeMultiLine = /(?![\t\n])[\p{Cc}\p{Cf}\p{Zl}\p{Zp}\p{Cs}]/gu;

function escape(c: string): string {
	return `\\u${c.codePointAt(0)!.toString(16).padStart(4, '0')}`;
}

function cut(text: string, maxChars: number): string {
	const chars = [...text];
	return chars.length > maxChars ? `${chars.slice(0, maxChars).join('')}…` : text;
}

/**
 * One line of outside text for a message or a screen: escapes as above, cut to `maxChars`
 * characters (with "…") so a megabyte-long name cannot flood the terminal.
 */
export function printable(text: string, maxChars = 200): string {
	return cut(String(text), maxChars).replace(unsafeSingleLine, escape);
}

/** Like `printable`, but keeps tabs and line breaks (notes that span lines). */
export function printableLines(text: string, maxChars = 4000): string {
	return cut(String(text), maxChars).replace(/\r\n?/g, '\n').replace(unsafeMultiLine, escape);
}
