import {readdirSync, readFileSync} from 'node:fs';
import {join, relative} from 'node:path';
import {describe, expect, it} from 'vitest';

/**
 * The formatter (biome format, width 120, run by `npm test` through `biome check`) wraps code, but not
 * long strings and comments: this holds every source line, those included, to 140 characters.
 */
const root = join(import.meta.dirname, '..', '..');
const limit = 140;

function sources(dir: string): string[] {
	return readdirSync(dir, {withFileTypes: true}).flatMap((e) => {
		const path = join(dir, e.name);
		if (e.isDirectory()) return sources(path);
		return /\.(ts|tsx|mjs)$/.test(e.name) ? [path] : [];
	});
}

describe('line length', () => {
	it(`no line in src, test or bench is longer than ${limit} characters`, () => {
		const long: string[] = [];
		for (const file of ['src', 'test', 'bench'].flatMap((d) => sources(join(root, d)))) {
			readFileSync(file, 'utf8')
				.split('\n')
				.forEach((line, i) => {
					// Tabs count as one character, as the formatter's width does not; this keeps the rule simple.
					if ([...line].length > limit) long.push(`${relative(root, file)}:${i + 1} (${[...line].length})`);
				});
		}
		expect(long).toEqual([]);
	});
});
