/**
 * The pure layers stay pure (design rule): the physics core, the plan, the reports and tables, and
 * the console's state. Nothing they reach through their imports may load Ink, React, conf, a Node
 * built-in or another package that touches the terminal or the disk, or read `process`. The check
 * follows imports transitively, so a pure file cannot borrow I/O through a helper.
 */
import {describe, expect, it} from 'vitest';
import {importSpecifiers, reachable, readSourceFiles, readsProcess} from '../helpers/import-graph.js';

const files = readSourceFiles();

/** Packages a pure layer may reach: validation and text formats, nothing with I/O. */
const allowedPackages = new Set(['zod', 'zod/mini', 'csv-stringify/sync']);

const pureFolders = ['engine', 'speckle', 'analysis', 'simulate', 'calibration', 'plan', 'report', 'table', 'ui/state'];

describe('the import reader sees every form of import', () => {
	it('static imports in any quotes, re-exports, import type, import() and require', () => {
		const text = [
			`import a from "ink";`,
			`import {b} from 'react';`,
			`import type {C} from 'conf';`,
			`export * from "node:fs";`,
			'const d = await import(`node:child_process`);',
			`const e = await import('node:os');`,
			`const f = require("node:path");`,
		].join('\n');
		expect(importSpecifiers(text)).toEqual([
			'ink',
			'react',
			'conf',
			'node:fs',
			'node:child_process',
			'node:os',
			'node:path',
		]);
	});

	it('finds process in code, not in comments or strings', () => {
		expect(readsProcess('const x = process.env;')).toBe(true);
		expect(readsProcess('/** process.stderr fits */ const s = "process.exit";')).toBe(false);
	});
});

/**
 * The table's thread runner starts worker threads by design; it is the one impure corner of src/table, and the
 * last test below checks that no pure file reaches it.
 */
const threadRunner = new Set(['table/sweep-parallel.ts', 'table/sweep-worker.ts']);

describe.each(pureFolders)('src/%s is pure', (folder) => {
	const own = files.filter((f) => f.folder === folder && !threadRunner.has(f.path));

	it('has files to check', () => {
		expect(own.length).toBeGreaterThan(0);
	});

	for (const file of own) {
		it(`${file.path} reaches no I/O, terminal or process through any import`, () => {
			for (const f of reachable(files, [file])) {
				for (const p of f.packages)
					expect(allowedPackages.has(p), `${file.path} reaches ${f.path}, which imports ${p}`).toBe(true);
				expect(readsProcess(f.text), `${file.path} reaches ${f.path}, which reads process`).toBe(false);
			}
		});
	}
});

describe('src/engine is the core', () => {
	it('imports only engine modules', () => {
		for (const f of files.filter((x) => x.folder === 'engine')) {
			expect(f.packages, f.path).toEqual([]);
			for (const l of f.locals) expect(l.startsWith('engine/'), `${f.path} imports ${l}`).toBe(true);
		}
	});
});

describe('the table thread runner', () => {
	it('is reached by no pure file', () => {
		for (const file of files.filter((f) => pureFolders.includes(f.folder) && !threadRunner.has(f.path))) {
			for (const f of reachable(files, [file]))
				expect(threadRunner.has(f.path), `${file.path} reaches ${f.path}`).toBe(false);
		}
	});
});
