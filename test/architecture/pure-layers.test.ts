/** The physics core stays pure: no Ink, React, conf, file system or process access (design rule). */
import {readdirSync, readFileSync} from 'node:fs';
import {describe, expect, it} from 'vitest';

const engineDir = new URL('../../src/engine/', import.meta.url);
const files = readdirSync(engineDir).filter((f) => f.endsWith('.ts'));

describe('src/engine is a pure core', () => {
	for (const file of files) {
		it(`${file} imports only engine modules and touches no process or I/O`, () => {
			const text = readFileSync(new URL(file, engineDir), 'utf8');
			const imports = [...text.matchAll(/from\s+'([^']+)'/g)].map((m) => m[1]!);
			for (const spec of imports) expect(spec.startsWith('./'), `${file} imports ${spec}`).toBe(true);
			expect(text).not.toMatch(/\bprocess\.|require\(|import\(/);
		});
	}
});
