/**
 * Keystroke tests for the fat sweep's export (step 5's sweep view, key e): it goes through the
 * plan export's folder prompt and write path, so it asks for the folder (the current one
 * offered), asks before replacing, refuses a link under a name with nothing written, writes the
 * four formats as one batch, and says the full path, readable whole at 80x24 even for a long
 * folder. Behaviour of the file layer's rules (atomic, all or nothing, regular files only) and of
 * the screen; no physics is asserted.
 */
import {
	existsSync,
	lstatSync,
	mkdirSync,
	mkdtempSync,
	readFileSync,
	readlinkSync,
	rmSync,
	symlinkSync,
	writeFileSync,
} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {wrapAtBreaks} from '../../src/ui/frame/status-line.js';
import {hintText} from '../../src/ui/frame/hint-line.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {keys} from '../helpers/keys.js';
import {frame, press, ready, type, waitForText, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

const stem = 'demo-deep-liver-through-thick-fat.fat-sweep';
const formats = ['md', 'csv', 'json', 'svg'] as const;

function tempDir(prefix: string): string {
	const d = mkdtempSync(join(tmpdir(), prefix));
	dirs.push(d);
	return d;
}

async function openSweep(exportDir: string, columns = 80, rows = 24) {
	const home = tempDir('evenecho-sweep-home-');
	const app = render(
		<App shelf={openShelf({home})} theme={plainTheme} exportDir={exportDir} columns={columns} rows={rows} />,
	);
	apps.push(app);
	await ready(app);
	await press(app, 'f');
	await waitForText(app, 'Sweep over fat thickness');
	return app;
}

/** The frame with a wrapped notice joined back: lines broke at a space or after a `/`. */
const joined = (f: string) => f.replace(/\/\n/g, '/').replace(/\n/g, ' ');

describe('fat sweep export: the plan export prompt and write path', () => {
	it('offers the current folder, writes the four formats where typed, and says the full path whole at 80x24', async () => {
		const base = tempDir('evenecho-sweep-export-');
		// A long folder: the written path is longer than one 80-column line.
		const folder = join(base, 'department-protocols', 'abdominal-liver-series', 'habitus-sweeps-2026');
		mkdirSync(folder, {recursive: true});
		const app = await openSweep(base);
		await press(app, 'e');
		expect(frame(app)).toContain(`Export to folder: [${base}_]`);
		await type(app, folder);
		// The prompt keeps the end of a long folder in view, where the typing is.
		expect(frame(app)).toContain(`Export to folder: […${folder.slice(-58)}_]`);
		await press(app, keys.enter);
		await waitForText(app, 'Wrote ');
		const f = frame(app);
		const said = `Wrote ${join(folder, `${stem}.md`)}, .csv, .json and .svg`;
		expect(said.length).toBeGreaterThan(80);
		expect(joined(f)).toContain(said);
		// Every line fits 80 columns, the frame keeps its 23 lines, and the notice lines are the wrap of the whole text.
		const lines = f.split('\n');
		for (const line of lines) expect(line.length).toBeLessThanOrEqual(80);
		expect(lines).toHaveLength(23);
		for (const line of wrapAtBreaks(said, 80)) expect(lines).toContain(line);
		for (const ext of formats) expect(existsSync(join(folder, `${stem}.${ext}`))).toBe(true);
		expect(existsSync(join(base, `${stem}.md`))).toBe(false);
		// The next key gives the key hints their line back; the folder typed is offered next time.
		await press(app, keys.down);
		expect(frame(app)).toContain(hintText('sweep', 80));
		await press(app, 'e');
		expect(frame(app)).toContain(`${folder.slice(-58)}_]`);
	});

	it('asks before replacing: n leaves the files, y replaces them all', async () => {
		const base = tempDir('evenecho-sweep-export-');
		for (const ext of ['md', 'svg']) writeFileSync(join(base, `${stem}.${ext}`), 'older');
		const app = await openSweep(base);
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Replace the 2 files already there? (y/n)');
		await press(app, 'n');
		await waitForText(app, 'Nothing changed.');
		expect(readFileSync(join(base, `${stem}.md`), 'utf8')).toBe('older');
		// Nothing half-written: the two free names were not taken either.
		expect(existsSync(join(base, `${stem}.csv`))).toBe(false);
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Replace the 2 files');
		await press(app, 'y');
		await waitForText(app, 'Wrote ');
		expect(readFileSync(join(base, `${stem}.md`), 'utf8')).toContain('# Depth-gain protocol table');
		expect(readFileSync(join(base, `${stem}.svg`), 'utf8')).toContain('<svg');
		expect(JSON.parse(readFileSync(join(base, `${stem}.json`), 'utf8')).format).toBe('evenecho-table/1');
		// Still on the sweep view.
		expect(frame(app)).toContain('Thicknesses, cm');
	});

	it('refuses a link under a name, writes none of the four, and refuses a folder that is not there', async () => {
		const base = tempDir('evenecho-sweep-export-');
		writeFileSync(join(base, 'elsewhere.txt'), 'keep');
		symlinkSync(join(base, 'elsewhere.txt'), join(base, `${stem}.csv`));
		const app = await openSweep(base);
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Replace the file already there?');
		await press(app, 'y');
		await waitForText(app, 'nothing written');
		expect(lstatSync(join(base, `${stem}.csv`)).isSymbolicLink()).toBe(true);
		expect(readlinkSync(join(base, `${stem}.csv`))).toBe(join(base, 'elsewhere.txt'));
		expect(readFileSync(join(base, 'elsewhere.txt'), 'utf8')).toBe('keep');
		for (const ext of ['md', 'json', 'svg']) expect(existsSync(join(base, `${stem}.${ext}`))).toBe(false);
		await press(app, 'e');
		await type(app, join(base, 'missing'));
		await press(app, keys.enter);
		await waitForText(app, 'does not exist');
	});
});
