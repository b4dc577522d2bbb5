/**
 * Folders import only folders below them, and no file imports itself back through others. The
 * layers, lowest first; folders on one line are siblings and do not import each other. A new folder
 * must be placed here before its code can land (DEVELOPERS.md draws the same picture).
 */
import {readFileSync} from 'node:fs';
import {describe, expect, it} from 'vitest';
import {importLoops, readSourceFiles} from '../helpers/import-graph.js';

const layers: readonly (readonly string[])[] = [
	['errors', 'runtime'],
	['engine', 'files', 'speckle'],
	['plan', 'analysis', 'simulate', 'calibration'],
	['report', 'image'],
	['table', 'store'],
	['ui/kit'],
	['ui/state', 'ui/picture'],
	['ui/frame', 'ui/plot'],
	['ui/steps', 'ui/sweep', 'ui/scanner'],
	['ui/effects', 'ui/refine'],
	['ui'],
	['cli'],
];

const rank = new Map(layers.flatMap((names, i) => names.map((n) => [n, i] as const)));
const files = readSourceFiles();
const folderOf = (path: string) => (path.includes('/') ? path.slice(0, path.lastIndexOf('/')) : '.');

/** The layers as DEVELOPERS.md draws them: top (imports most) to bottom (imports nothing of ours). */
function layerDrawing(): string {
	return [...layers]
		.reverse()
		.map((names) => names.map((n) => `src/${n}`).join('   '))
		.join('\n   ↓\n');
}

describe('the import graph of src/', () => {
	it('DEVELOPERS.md shows these layers', () => {
		const developers = readFileSync(new URL('../../DEVELOPERS.md', import.meta.url), 'utf8');
		expect(developers, `DEVELOPERS.md should hold this drawing:\n${layerDrawing()}`).toContain(layerDrawing());
	});

	it('every folder has a place in the layers', () => {
		const unplaced = [...new Set(files.map((f) => f.folder))].filter((f) => !rank.has(f));
		expect(unplaced, 'add these folders to the layers in test/architecture/import-graph.test.ts').toEqual([]);
	});

	it('no folder imports a folder above it or beside it', () => {
		const wrong: string[] = [];
		for (const f of files) {
			for (const target of f.locals) {
				const to = folderOf(target);
				if (to === f.folder) continue;
				const from = rank.get(f.folder);
				const below = rank.get(to);
				if (from === undefined || below === undefined || below >= from) wrong.push(`${f.path} → ${target}`);
			}
		}
		expect(wrong).toEqual([]);
	});

	it('has no import loops between files', () => {
		expect(importLoops(files)).toEqual([]);
	});

	it('the loop finder finds a loop', () => {
		const fake = (path: string, locals: string[]) => ({path, folder: folderOf(path), packages: [], locals, text: ''});
		const loops = importLoops([
			fake('a/x.ts', ['a/y.ts']),
			fake('a/y.ts', ['a/z.ts']),
			fake('a/z.ts', ['a/x.ts']),
			fake('a/w.ts', ['a/x.ts']),
		]);
		expect(loops).toEqual([['a/x.ts', 'a/y.ts', 'a/z.ts']]);
	});
});
