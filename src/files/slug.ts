/**
 * The one slug rule: the file-name form of a name (preset files, export files). Lower case, accents
 * dropped, every run of other characters one hyphen, no hyphen at either end. Letters of any script
 * stay letters, so "Щитовидна залоза" keeps its words.
 */

export interface SlugOptions {
	/** Cut to this many characters (at a character, then trailing hyphens dropped). */
	readonly maxChars?: number;
	/** Returned when nothing nameable is left. @default '' */
	readonly fallback?: string;
}

export function slug(name: string, options: SlugOptions = {}): string {
	// Lower, upper, lower: a case fold for letters with several lower-case forms (ᲀ/в, ẞ/ß/ss).
	let out = name
		.normalize('NFKD')
		.toLowerCase()
		.toUpperCase()
		.toLowerCase()
		.normalize('NFKD')
		.replace(/\p{M}/gu, '')
		.replace(/[^\p{L}\p{N}]+/gu, '-')
		.replace(/^-+|-+$/g, '');
	if (options.maxChars !== undefined) out = [...out].slice(0, options.maxChars).join('').replace(/-+$/, '');
	return out || (options.fallback ?? '');
}
