/**
 * Text from outside: one encoding rule (UTF-8, a byte-order mark allowed, UTF-16/32 named and
 * refused), one JSON rule (duplicate keys named, prototype keys, depth, unsafe text), one
 * text-field rule, and one way to make text printable.
 */
import {describe, expect, it} from 'vitest';
import {z} from 'zod';
import {printable, printableLines} from '../../src/files/printable.js';
import {parseStrictJson} from '../../src/files/strict-json.js';
import {findUnsafeCharacter, safeText} from '../../src/files/text-field.js';
import {decodeText} from '../../src/files/text-encoding.js';
import {slug} from '../../src/files/slug.js';

describe('decodeText', () => {
	it('UTF-8 with or without a byte-order mark gives the same text', () => {
		expect(decodeText(Buffer.from('{"a":"é"}'))).toEqual({ok: true, text: '{"a":"é"}'});
		expect(decodeText(Buffer.from('\ufeff{"a":"é"}'))).toEqual({ok: true, text: '{"a":"é"}'});
	});

	it('UTF-16 is named (with and without a mark) and the fix is said, never echoed raw', () => {
		const le = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('{"a":1}', 'utf16le')]);
		const bare = Buffer.from('{"a":1}', 'utf16le');
		const be = Buffer.from([0xfe, 0xff, 0, 0x7b]);
		for (const [bytes, name] of [
			[le, 'UTF-16 (little-endian)'],
			[bare, 'UTF-16 (little-endian, no byte-order mark)'],
			[be, 'UTF-16 (big-endian)'],
		] as const) {
			const r = decodeText(bytes);
			expect(r.ok).toBe(false);
			if (!r.ok) {
				expect(r.problem).toContain(`is ${name} text`);
				expect(r.problem).toContain('save it as UTF-8');
			}
		}
	});

	it('bytes that are not UTF-8 are refused', () => {
		const r = decodeText(Buffer.from([0x7b, 0xff, 0xfe, 0x7d]));
		expect(r.ok).toBe(false);
	});
});

describe('parseStrictJson', () => {
	it('a key given twice is refused with the key and where it is', () => {
		const r = parseStrictJson('{"probe": {"centerMhz": 3, "centerMhz": 5}}');
		expect(r).toEqual({
			ok: false,
			kind: 'refused',
			problem: 'probe: the key "centerMhz" appears more than once; keep one',
		});
		const top = parseStrictJson('{"name": "a", "layers": [], "name": "b"}');
		expect(top.ok || top.problem).toBe('(top): the key "name" appears more than once; keep one');
	});

	it('keys that differ only by escaping are the same key', () => {
		const r = parseStrictJson('{"name": 1, "n\\u0061me": 2}');
		expect(r.ok).toBe(false);
	});

	it('the same key in two different objects is fine, inside arrays too', () => {
		expect(parseStrictJson('[{"a": 1}, {"a": 2, "b": {"a": 3}}]').ok).toBe(true);
		expect(parseStrictJson('{"a": "x\\"", "b": ["a", "a"]}').ok).toBe(true);
	});

	it('prototype keys, deep nesting and control characters are refused; the path is named', () => {
		expect(parseStrictJson('{"__proto__": {}}')).toMatchObject({ok: false, kind: 'refused'});
		expect(parseStrictJson(`${'['.repeat(40)}${']'.repeat(40)}`)).toMatchObject({
			ok: false,
			problem: expect.stringContaining('nested deeper'),
		});
		const r = parseStrictJson('{"layers": [{"tissue": "fat\\u001b[2J"}]}');
		expect(r).toMatchObject({ok: false, kind: 'refused'});
		if (!r.ok) expect(r.problem).toMatch(/^layers\.0\.tissue: contains a control .*U\+001B at character 4/);
	});

	it('a syntax error quoting a hostile byte is shown escaped', () => {
		const r = parseStrictJson('{"a": \u001b]0;owned\u0007}');
		expect(r.ok).toBe(false);
		if (!r.ok) {
			expect(r.kind).toBe('syntax');
			expect(r.problem).not.toMatch(/[\u0000-\u001f]/);
		}
	});
});

describe('the text-field rule', () => {
	it('names the first character it refuses', () => {
		expect(findUnsafeCharacter('liver')).toBeUndefined();
		expect(findUnsafeCharacter('li\u001bver')).toBe('U+001B at character 3');
		expect(findUnsafeCharacter('a\u202eb')).toBe('U+202E at character 2');
		expect(findUnsafeCharacter('line\nbreak')).toBe('U+000A at character 5');
		expect(findUnsafeCharacter('line\nbreak\ttab', {multiline: true})).toBeUndefined();
	});

	it('as a zod refinement it gives a message naming the rule', () => {
		const name = safeText(z.string().max(80));
		expect(name.safeParse('Liver, thin').success).toBe(true);
		const bad = name.safeParse('x\u009b31m');
		expect(bad.success).toBe(false);
		expect(bad.error?.issues[0]?.message).toBe(
			'must be one line without control or invisible formatting characters (found U+009B at character 2)',
		);
	});
});

describe('printable', () => {
	it('escapes every control, format and separator character, and cuts long text', () => {
		expect(printable('a\u001b[2Jb\u009b\u202e\u2028\u200b')).toBe('a\\u001b[2Jb\\u009b\\u202e\\u2028\\u200b');
		expect(printable('x'.repeat(300), 10)).toBe(`${'x'.repeat(10)}…`);
		expect(printable('\ud800')).toBe('\\ud800');
	});

	it('printableLines keeps line breaks and tabs only', () => {
		expect(printableLines('one\r\ntwo\tthree\u001b')).toBe('one\ntwo\tthree\\u001b');
	});
});

describe('slug', () => {
	it('one rule for preset files and export files', () => {
		expect(slug('Demo – deep liver / thick fat')).toBe('demo-deep-liver-thick-fat');
		expect(slug('Épaule – Sus-épineux')).toBe('epaule-sus-epineux');
		expect(slug('---', {fallback: 'plan'})).toBe('plan');
		expect(slug('abc def ghi', {maxChars: 5})).toBe('abc-d');
		expect(slug('abc def', {maxChars: 4})).toBe('abc');
	});
});
