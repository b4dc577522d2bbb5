/**
 * Preset names and the ids and file names made from them.
 *
 * A name is what the user types and sees; its slug (lower case, letters and digits joined by
 * hyphens) names the file, so two names that differ only in case, accents, spaces or punctuation
 * are the same preset. That keeps lookups predictable and lets the file system's exclusive create
 * settle who wins when two processes save the same name at once.
 */
import {printable} from '../files/printable.js';
import {slug} from '../files/slug.js';
import {PresetNameError} from './store-errors.js';

export {printable};

/** Length of a preset name, in characters. */
export const presetNameLimits = {minLength: 1, maxLength: 60} as const;

/** Every user preset id starts with this, so it can never equal a template id (plain slugs). */
export const userIdPrefix = 'user:';

/** Punctuation allowed inside a name besides letters, digits and spaces. */
const punctuation = "-_.,()+'&–";
const namePattern = new RegExp(`^[\\p{L}\\p{N}][\\p{L}\\p{M}\\p{N} ${escapeForClass(punctuation)}]*$`, 'u');
/** Device names Windows refuses as file names (teams keep stores on shared drives). */
const reservedSlugs = new Set([
	'con',
	'prn',
	'aux',
	'nul',
	...[1, 2, 3, 4, 5, 6, 7, 8, 9].flatMap((n) => [`com${n}`, `lpt${n}`]),
]);
/** Well under the usual 255-byte file-name limit, leaving room for ".json" and backup suffixes. */
const maxSlugBytes = 180;

function escapeForClass(chars: string): string {
	return chars.replace(/[-\\\]^]/g, '\\$&');
}

/** Human-readable statement of the rule, for messages and help. */
export const presetNameRule =
	`${presetNameLimits.minLength} to ${presetNameLimits.maxLength} characters: letters, ` +
	`digits, spaces and ${[...punctuation].join(' ')}, starting with a letter or digit`;

/** The file-name form of a name (the project's one slug rule, src/files/slug.ts). */
export function presetSlug(name: string): string {
	return slug(name);
}

/**
 * Checks a preset name and returns it trimmed and in Unicode NFC form.
 * @throws PresetNameError naming the rule the name breaks.
 */
export function checkPresetName(input: unknown, field = 'name'): string {
	if (typeof input !== 'string') throw new PresetNameError(`${field}: must be a preset name of ${presetNameRule}`);
	const name = input.normalize('NFC').trim();
	const length = [...name].length;
	if (length < presetNameLimits.minLength || length > presetNameLimits.maxLength) {
		throw new PresetNameError(
			`${field}: "${printable(name)}" has ${length} characters; a preset name has ${presetNameRule}`,
		);
	}
	if (!namePattern.test(name)) {
		throw new PresetNameError(
			`${field}: "${printable(name)}" contains characters a preset name cannot have; allowed: ${presetNameRule}`,
		);
	}
	const slug = presetSlug(name);
	// Some compatibility characters decompose to marks only, which leaves nothing to name a file.
	if (!slug)
		throw new PresetNameError(
			`${field}: "${printable(name)}" has no letters or digits that can name a file; use ordinary letters or digits`,
		);
	if (reservedSlugs.has(slug))
		throw new PresetNameError(
			`${field}: "${printable(name)}" is reserved as a file name on Windows; choose another name`,
		);
	if (Buffer.byteLength(slug, 'utf8') > maxSlugBytes)
		throw new PresetNameError(`${field}: "${printable(name)}" is too long once written as a file name; shorten it`);
	return name;
}

/** The slug inside a user-preset id, or undefined when the text is not one. */
export function slugOfUserId(id: string): string | undefined {
	if (!id.startsWith(userIdPrefix)) return undefined;
	const slug = id.slice(userIdPrefix.length);
	return slug.length > 0 && presetSlug(slug) === slug ? slug : undefined;
}
