/** The calibration is pure like the engine: no Ink, React, conf, file system or process access (design rule). */
import {readdirSync, readFileSync} from 'node:fs';
import {describe, expect, it} from 'vitest';

const dir = new URL('../../src/calibration/', import.meta.url);
const files = readdirSync(dir).filter((f) => f.endsWith('.ts'));

describe('src/calibration is pure', () => {
	for (const file of files) {
		it(`${file} imports only calibration, engine modules and zod, and touches no process or I/O`, () => {
			const text = readFileSync(new URL(file, dir), 'utf8');
			const imports = [...text.matchAll(/from\s+'([^']+)'/g)].map((m) => m[1]!);
			for (const spec of imports) {
				expect(spec.startsWith('./') || spec.startsWith('../engine/') || spec === 'zod', `${file} imports ${spec}`).toBe(true);
			}
			expect(text).not.toMatch(/\bprocess\.|require\(|import\(/);
		});
	}
});
