/**
 * Preset names: the safe character set and length, and the slug that becomes the file name and id.
 */
import fc from 'fast-check';
import {describe, expect, it} from 'vitest';
import {checkPresetName, presetSlug, printable, slugOfUserId, userIdPrefix} from '../../src/store/safe-name.js';
import {PresetNameError} from '../../src/store/store-errors.js';
import {loadTemplates} from '../../src/store/templates.js';

const slugShape = /^[\p{L}\p{N}]+(?:-[\p{L}\p{N}]+)*$/u;

describe('preset names', () => {
	it('accepts ordinary names, trimmed and in NFC', () => {
		expect(checkPresetName('  Liver, thick fat (Bed 7) ')).toBe('Liver, thick fat (Bed 7)');
		expect(checkPresetName('Nie\u0300re gauche')).toBe('Nière gauche');
		expect(checkPresetName('肝臓 3.5 MHz')).toBe('肝臓 3.5 MHz');
		expect(checkPresetName('x'.repeat(60))).toHaveLength(60);
	});

	it.each([
		['empty', ''],
		['only spaces', '   '],
		['61 characters', 'x'.repeat(61)],
		['a slash', 'a/b'],
		['a backslash', 'a\\b'],
		['a leading dot', '.x'],
		['a leading hyphen', '-x'],
		['a colon (ids use it)', 'user:x'],
		['a newline', 'a\nb'],
		['a bidi override', 'a\u202eb'],
		['a zero-width joiner', 'a\u200db'],
		['a Windows device name', 'com1'],
		['only a compatibility form that decomposes to a mark', '\ufe74'],
	])('refuses %s', (_what, name) => {
		expect(() => checkPresetName(name)).toThrow(PresetNameError);
	});

	it('refuses what is not text, naming the field', () => {
		expect(() => checkPresetName(7, 'presets.2.name')).toThrow(
			/^presets\.2\.name: must be a preset name of 1 to 60 characters/,
		);
	});

	it('any accepted name gives a file-safe slug and an id that maps back to it', () => {
		fc.assert(
			fc.property(fc.string({unit: 'grapheme', maxLength: 70}), (raw) => {
				let name: string;
				try {
					name = checkPresetName(raw);
				} catch (error) {
					expect(error).toBeInstanceOf(PresetNameError);
					return;
				}
				const slug = presetSlug(name);
				expect(slug).toMatch(slugShape);
				expect(slug).not.toMatch(/[/\\.:\s]/);
				expect(slugOfUserId(userIdPrefix + slug)).toBe(slug);
				// The store recognises its own files by this: a slug is its own slug.
				expect(presetSlug(slug)).toBe(slug);
				expect(presetSlug(name.toUpperCase())).toBe(presetSlug(name.toLowerCase()));
			}),
			{numRuns: 5000},
		);
	});

	it('names that differ only in case, accents, spaces or punctuation are the same preset', () => {
		const slugs = ['Liver A', 'liver-a', 'LIVER  A', 'Lïver, A', 'Liver (A)'].map((n) =>
			presetSlug(checkPresetName(n)),
		);
		expect(new Set(slugs)).toEqual(new Set(['liver-a']));
	});

	it('every template name is a valid preset name, so a template can be saved under its own name', () => {
		for (const t of loadTemplates().templates) expect(checkPresetName(t.plan.name)).toBe(t.plan.name);
	});

	it('printable escapes control and format characters', () => {
		expect(printable('a\u001b[2Jb\u202e')).toBe('a\\u001b[2Jb\\u202e');
	});
});
