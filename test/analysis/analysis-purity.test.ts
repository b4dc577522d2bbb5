/** Image analysis is part of the pure core: no Ink, React, conf, file system or process (design rule). */
import {readdirSync, readFileSync} from 'node:fs';
import {describe, expect, it} from 'vitest';

const dir = new URL('../../src/analysis/', import.meta.url);
const files = readdirSync(dir).filter((f) => f.endsWith('.ts'));

describe('src/analysis is pure', () => {
	for (const file of files) {
		it(`${file} imports only analysis, speckle and engine modules and touches no process or I/O`, () => {
			const text = readFileSync(new URL(file, dir), 'utf8');
			const imports = [...text.matchAll(/from\s+'([^']+)'/g)].map((m) => m[1]!);
			for (const spec of imports) {
				expect(
					['./', '../engine/', '../speckle/'].some((p) => spec.startsWith(p)),
					`${file} imports ${spec}`,
				).toBe(true);
			}
			expect(text).not.toMatch(/\bprocess\.|require\(|import\(/);
		});
	}
});
