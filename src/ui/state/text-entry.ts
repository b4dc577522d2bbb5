/**
 * The one way text is typed into a field anywhere in the console (a number, a tissue name, a
 * preset name, the sweep's thickness list, the tissue picker's filter). A field opens with its
 * current text marked: the first typed character replaces it, as in a form whose text is selected
 * on entry; Backspace instead keeps it and edits it from the end. Pure.
 */

export interface TextEntry {
	readonly text: string;
	/** True until the first key: typing then replaces the shown text, Backspace edits it. */
	readonly isFresh: boolean;
}

/** How the status line says what the next key does to a fresh field. */
export const freshHint = 'typing replaces, Backspace edits';

/** A field opened on `text`, marked so the first typed character replaces it. */
export function openEntry(text: string): TextEntry {
	return {text, isFresh: true};
}

/** Typed characters (already checked by the caller) added, or replacing a fresh text; cut at `max`. */
export function typeInto(entry: TextEntry, chars: string, max: number): TextEntry {
	return {text: ((entry.isFresh ? '' : entry.text) + chars).slice(0, max), isFresh: false};
}

/** Backspace: the last character gone; a fresh text is kept and edited. */
export function eraseIn(entry: TextEntry): TextEntry {
	return {text: entry.text.slice(0, -1), isFresh: false};
}

/** Only printable characters (a paste may carry line breaks or escapes). */
export function printableChars(input: string): string {
	return [...input].filter((c) => c >= ' ' && c !== '\u007F').join('');
}
