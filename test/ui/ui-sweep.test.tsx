/**
 * Step 5's fat-thickness sweep: the view model on its own (rows and columns for a width and an
 * offset), then the console driven by keystrokes: open, edit the list, a refusal, deltas, scrolling,
 * export of the four formats into the current directory, and back.
 */
import {existsSync, mkdtempSync, readdirSync, readFileSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {parse} from 'csv-parse/sync';
import {XMLValidator} from 'fast-xml-parser';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {demoPlan} from '../../src/plan/demo-plan.js';
import type {PlanDocument} from '../../src/plan/plan-schema.js';
import {cautionLine} from '../../src/report/cautions.js';
import {buildTable} from '../../src/table/sweep-runner.js';
import {App} from '../../src/ui/app.js';
import {consoleReducer, modeOf} from '../../src/ui/state/console-reducer.js';
import {createInitialState, type ConsoleState} from '../../src/ui/state/console-state.js';
import {bindings, noFlags, resolveIntent, type KeyFlags} from '../../src/ui/state/key-intents.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {demoPoint} from '../../src/ui/state/starting-point.js';
import {defaultFatCm, maxSweepValues} from '../../src/ui/state/sweep-state.js';
import {consoleMessage, parseFatList, sweepTable} from '../../src/ui/state/sweep-table.js';
import {columnHeads, frozenWidth, maxColumnOffset, sweepGrid, warningKey} from '../../src/ui/state/sweep-view-model.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {keys} from '../helpers/keys.js';
import {
	frame,
	moveToMarked,
	press,
	ready,
	selectedLine,
	send,
	type,
	waitForText,
	type Rendered,
} from '../helpers/press.js';

const stem = 'demo-deep-liver-through-thick-fat.fat-sweep';
const formats = ['md', 'csv', 'json', 'svg'] as const;

const dirs: string[] = [];
const apps: Rendered[] = [];
const startDir = process.cwd();
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	process.chdir(startDir);
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

function tempDir(): string {
	const d = mkdtempSync(join(tmpdir(), 'evenecho-sweep-'));
	dirs.push(d);
	return d;
}

/** The console with no export folder given, so exports go to the current directory (a temp one). */
async function open(options: {columns?: number; rows?: number; plan?: PlanDocument} = {}) {
	const cwd = tempDir();
	process.chdir(cwd);
	const app = render(
		<App
			shelf={openShelf({home: tempDir()})}
			theme={plainTheme}
			columns={options.columns ?? 80}
			rows={options.rows ?? 24}
			{...(options.plan ? {initialPlan: options.plan} : {})}
		/>,
	);
	apps.push(app);
	await ready(app);
	return {app, cwd};
}

/** The demo plan with its fat layer made muscle: nothing to sweep. */
function planWithoutFat(): PlanDocument {
	const doc = demoPlan();
	return {
		...doc,
		name: 'No fat here',
		layers: doc.layers.map((l) => (l.tissue === 'fat' ? {...l, tissue: 'muscle'} : l)),
	};
}

const state = (doc: PlanDocument = demoPlan(), columns = 80) =>
	createInitialState({
		doc,
		originName: demoPoint.name,
		startingPoints: [demoPoint],
		isWide: columns >= 100,
		columns,
		rows: columns >= 100 ? 30 : 24,
	});

function keysIn(s: ConsoleState, ...presses: (string | Partial<KeyFlags>)[]): ConsoleState {
	return presses.reduce<ConsoleState>((st, p) => {
		const key = typeof p === 'string' ? {...noFlags, shift: /^[A-Z]$/.test(p)} : {...noFlags, ...p};
		return consoleReducer(st, {type: 'key', input: typeof p === 'string' ? p : '', key});
	}, s);
}

describe('sweep view model', () => {
	const table = buildTable(demoPlan(), {fatCm: [1, 2, 3, 4, 5, 6, 8]});
	const deltas = buildTable(demoPlan(), {fatCm: [1, 2, 3, 4, 5, 6, 8], delta: true});

	it('keeps the thickness column and shows as many others as fit 80 columns, with the position in words', () => {
		const g = sweepGrid(table, {width: 80, height: 20, cursor: 0, column: 0});
		expect(g.header[0]).toMatch(/^\s+fat\s+S1\s+S2/);
		expect(g.header[1]).toContain('@1.0');
		expect(g.lines).toHaveLength(7);
		expect(g.lines[0]!.text).toMatch(/^> {3}1\.0 /);
		expect(g.lines[0]!.isSelected).toBe(true);
		for (const l of [...g.header, ...g.lines.map((x) => x.text)]) expect(l.length).toBeLessThanOrEqual(80);
		expect(g.columnStart).toBe(0);
		expect(g.columnEnd).toBeLessThan(g.columnCount);
		expect(g.position).toBe(`rows 1-7 of 7  columns 1-${g.columnEnd} of ${g.columnCount}, → more`);
	});

	it('shows every column at 100 columns, and deltas add a delta-master column', () => {
		const g = sweepGrid(table, {width: 100, height: 20, cursor: 0, column: 0});
		expect(g.columnEnd).toBe(g.columnCount);
		expect(g.position).not.toContain('more');
		expect(g.header[0]).toContain('warnings');
		const d = sweepGrid(deltas, {width: 100, height: 20, cursor: 4, column: 0});
		expect(d.header[0]).toContain('ΔS1');
		expect(d.header[0]).toContain('Δmaster');
		// The plan's own 5 cm row is the standard: every delta zero.
		expect(d.lines[4]!.text).toMatch(/^>\s+5\.0(\s+\+0\.0){9}\s/);
		expect(maxColumnOffset(8, false, 100)).toBe(0);
	});

	it('scrolls columns up to the offset that shows the last one, never past it', () => {
		const max = maxColumnOffset(8, false, 80);
		expect(max).toBeGreaterThan(0);
		const g = sweepGrid(table, {width: 80, height: 20, cursor: 0, column: max + 5});
		expect(g.columnStart).toBe(max);
		expect(g.columnEnd).toBe(g.columnCount);
		expect(g.header[0]).toContain('warnings');
		expect(g.header[0]).not.toMatch(/\bS1\b/);
		expect(g.position).toContain('← more');
		expect(g.position).not.toContain('→ more');
		for (const l of [...g.header, ...g.lines.map((x) => x.text)]) expect(l.length).toBeLessThanOrEqual(80);
		// One column less would not show them all.
		const widths = columnHeads(8, false)
			.slice(max - 1)
			.reduce((n, c) => n + c.width, frozenWidth);
		expect(widths).toBeGreaterThan(80);
	});

	it('keeps the cursor row inside the window when the rows do not fit', () => {
		const big = buildTable(demoPlan(), {fatCm: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]});
		const g = sweepGrid(big, {width: 80, height: 5, cursor: 10, column: 0});
		expect(g.lines).toHaveLength(5);
		expect(g.lines.find((l) => l.isSelected)?.text).toMatch(/^>\s+11\.0/);
		expect(g.position).toMatch(/^rows 8-12 of 12 /);
	});

	it('names the warning codes the table uses, each led by a character, not a colour', () => {
		expect(warningKey(table)).toBeNull();
		const doc = demoPlan();
		const noisy = buildTable({...doc, probe: {...doc.probe, centerMhz: 9}}, {fatCm: [2, 6]});
		expect(warningKey(noisy)).toContain('~noise');
		expect(sweepGrid(noisy, {width: 100, height: 5, cursor: 0, column: 0}).lines[1]!.text).toContain('~noise');
	});

	it("defaults to 1, 2, 3, 4, 6, 8 cm with the plan's own thickness, and to finer steps for shallow displays", () => {
		expect(defaultFatCm(demoPlan())).toEqual([1, 2, 3, 4, 5, 6, 8]);
		const doc = demoPlan();
		const shallow = {
			...doc,
			display: {...doc.display, depthCm: 4},
			layers: doc.layers.map((l) => (l.tissue === 'fat' ? {...l, thicknessCm: 0.3} : l)),
		};
		expect(defaultFatCm(shallow)).toEqual([0.25, 0.3, 0.5, 0.75, 1, 1.5, 2]);
	});

	it("checks lists with the table code's parser, at most 16 values, messages naming the range", () => {
		expect(parseFatList(' 1:8:1 ')).toEqual({ok: true, fatCm: [1, 2, 3, 4, 5, 6, 7, 8]});
		const out = parseFatList('1,2,99');
		expect(out.ok).toBe(false);
		expect(!out.ok && out.message).toBe('99 is out of range; every value must be a number above 0 and up to 50 cm');
		const many = parseFatList('1:20:1');
		expect(!many.ok && many.message).toBe(`"1:20:1" makes 20 values; at most ${maxSweepValues} are allowed`);
		expect(
			consoleMessage(
				'--fat: the plan has no layer of tissue "fat"; choose the layer to sweep with --layer N (from 1 to 4)',
			),
		).toBe(
			'the plan has no layer of tissue "fat", so there is no thickness to sweep: give a layer the tissue Fat on step 2 (Tissue stack)',
		);
	});

	it('remembers a table per plan, list and deltas, and says plainly when there is no fat layer', () => {
		const doc = demoPlan();
		const a = sweepTable(doc, [1, 2], false);
		expect(sweepTable(doc, [1, 2], false)).toBe(a);
		expect(sweepTable(doc, [1, 2], true)).not.toBe(a);
		const none = sweepTable(planWithoutFat(), [1, 2], false);
		expect(none.ok).toBe(false);
		expect(!none.ok && none.message).toContain('the plan has no layer of tissue "fat"');
	});
});

describe('sweep in the reducer', () => {
	it('opens from the step 5 row and with f, and Esc goes back to step 5 on that row', () => {
		let s = keysIn(state(), '5');
		while (!(s.cursors.curve === s.doc.sliders.count + 2)) s = keysIn(s, {downArrow: true});
		s = keysIn(s, {return: true});
		expect(modeOf(s)).toBe('sweep');
		expect(s.sweep.row).toBe(4); // the plan's own 5 cm
		s = keysIn(s, {escape: true, meta: true});
		expect(modeOf(s)).toBe('browse');
		expect(s.step).toBe('curve');
		expect(s.cursors.curve).toBe(s.doc.sliders.count + 2);
		s = keysIn(keysIn(state(), '2'), 'f');
		expect(s.step).toBe('curve');
		expect(modeOf(s)).toBe('sweep');
	});

	it('clamps rows and columns, pages by about a screen, and queues the export with the list and deltas', () => {
		let s = keysIn(state(), 'f', {pageDown: true});
		expect(s.sweep.row).toBe(6);
		s = keysIn(s, {pageUp: true});
		expect(s.sweep.row).toBe(0);
		for (let i = 0; i < 20; i++) s = keysIn(s, {rightArrow: true});
		expect(s.sweep.column).toBe(maxColumnOffset(8, false, 80));
		s = keysIn(s, 'd');
		expect(s.sweep.isDelta).toBe(true);
		expect(s.sweep.column).toBe(Math.min(maxColumnOffset(8, false, 80), maxColumnOffset(8, true, 80)));
		s = keysIn(s, 'd', 'd');
		expect(s.sweep.isDelta).toBe(true);
		// e asks for the folder through the plan export's prompt (the current one offered), then queues the one export.
		s = keysIn(s, 'e');
		expect(s.overlay).toEqual({
			kind: 'path',
			text: '.',
			isFresh: true,
			sweep: {fatCm: [1, 2, 3, 4, 5, 6, 8], isDelta: true},
		});
		expect(modeOf(s)).toBe('edit-text');
		s = keysIn(s, {return: true});
		expect(s.effects).toEqual([
			{kind: 'export', dir: '.', replace: false, sweep: {fatCm: [1, 2, 3, 4, 5, 6, 8], isDelta: true}},
		]);
		expect(modeOf(s)).toBe('sweep');
		expect(s.dirty).toBe(false);
	});

	it('refuses letters as they are typed and a bad list on Enter, keeping the last good list', () => {
		let s = keysIn(state(), 'f', {return: true});
		expect(modeOf(s)).toBe('edit-list');
		s = keysIn(s, 'x');
		expect(s.sweep.refusal).toContain('above 0 and up to 50 cm');
		expect(s.sweep.typing?.text).toBe('1,2,3,4,5,6,8');
		s = keysIn(s, '0', {return: true});
		expect(s.sweep.refusal).toBe('0 is out of range; every value must be a number above 0 and up to 50 cm');
		expect(s.sweep.list).toBeNull();
		s = keysIn(s, {backspace: true}, '2', ',', '4', {return: true});
		expect(s.sweep.list).toEqual({text: '2,4', fatCm: [2, 4]});
		expect(modeOf(s)).toBe('sweep');
	});

	it('lists the new keys in the one key table, free of the keys already used in browsing', () => {
		expect(resolveIntent('browse', 'f', noFlags)?.intent).toBe('sweep');
		expect(resolveIntent('sweep', 'd', noFlags)?.intent).toBe('toggle-delta');
		expect(resolveIntent('sweep', '', {...noFlags, leftArrow: true})?.intent).toBe('scroll-left');
		expect(resolveIntent('sweep', 'e', noFlags)?.intent).toBe('export');
		expect(resolveIntent('sweep', 'c', {...noFlags, ctrl: true})?.intent).toBe('exit-now');
		expect(resolveIntent('edit-list', 'c', {...noFlags, ctrl: true})?.intent).toBe('exit-now');
		expect(bindings.filter((b) => b.modes.includes('browse') && b.keys.split(' ')[0] === 'f')).toHaveLength(1);
	});
});

describe('console: the fat-thickness sweep by keystrokes', () => {
	it('opens from step 5, edits the list, refuses a bad one, shows deltas, scrolls, exports the four formats, and goes back', async () => {
		const {app, cwd} = await open();
		await press(app, '5');
		// At 80 columns the actions sit beside the plot, so the mark is not at the start of the line.
		await moveToMarked(app, keys.down, '[ Sweep over fat thickness ]');
		await press(app, keys.enter);
		let f = frame(app);
		expect(f).toContain('Sweep over fat thickness: layer 2; the plan has 5.0 cm');
		expect(f).toContain('Thicknesses, cm: [1,2,3,4,5,6,8]');
		expect(f).toMatch(/rows 1-7 of 7 {2}columns 1-12 of 13, → more/);
		for (const cm of ['1.0', '2.0', '3.0', '4.0', '6.0', '8.0'])
			expect(f).toMatch(new RegExp(`^\\s+${cm.replace('.', '\\.')}\\s+[+-]\\d`, 'm'));
		expect(selectedLine(app)).toMatch(/^>\s+5\.0\s/);
		expect(f.replace(/\s+/g, ' ')).toContain(cautionLine);
		// The plain theme: no escape codes, the cursor row marked by `>` alone.
		expect(f).not.toContain('\u001B[');

		// A new list, as a range.
		await press(app, keys.enter);
		expect(frame(app)).toContain('Enter applies, Esc cancels');
		await type(app, '1:8:1');
		await press(app, keys.enter);
		f = frame(app);
		expect(f).toContain('Thicknesses, cm: [1:8:1]');
		expect(f).toContain('rows 1-8 of 8');
		expect(f).toMatch(/^\s+7\.0\s/m);

		// A bad list: the message beside the field, the last good table stays.
		await press(app, keys.enter);
		await type(app, '1,2,99');
		await press(app, keys.enter);
		f = frame(app);
		expect(f.replace(/\s+/g, ' ')).toContain(
			'99 is out of range; every value must be a number above 0 and up to 50 cm',
		);
		expect(f).toContain('rows 1-8 of 8');
		await press(app, keys.escape);
		expect(frame(app)).not.toContain('out of range');
		expect(frame(app)).toContain('[1:8:1]');

		// Deltas from the plan as it is: its own 5 cm row is all zeros.
		await press(app, 'd');
		f = frame(app);
		expect(f).toContain('ΔS1');
		expect(f).toContain('Δ = row minus the plan');
		expect(f).toMatch(/^[> ]\s+5\.0(\s+\+0\.0){8}/m);

		// Scrolling: rows with ↑↓ and PgUp/PgDn, columns with ←→.
		await press(app, keys.down);
		expect(selectedLine(app)).toMatch(/^>\s+6\.0\s/);
		await press(app, keys.pageDown);
		expect(selectedLine(app)).toMatch(/^>\s+8\.0\s/);
		await press(app, keys.pageUp);
		expect(selectedLine(app)).toMatch(/^>\s+1\.0\s/);
		await press(app, keys.right);
		expect(frame(app)).toContain('columns 2-');
		expect(frame(app)).toContain('← more');
		await press(app, keys.right, keys.right);
		expect(frame(app)).toContain('warnings');
		// Already showing the last column: one more press changes nothing.
		await send(app, keys.right);
		expect(frame(app)).toContain(`columns ${maxColumnOffset(8, true, 80) + 1}-14 of 14, ← more;`);
		expect(frame(app)).not.toContain('→ more');
		await press(app, keys.left);
		expect(frame(app)).toContain('→ more');

		// Export: the folder asked (the current one offered), four files written, the full path said, temp files gone.
		await press(app, 'e');
		expect(frame(app)).toContain(`Export to folder: [${cwd}`);
		await press(app, keys.enter);
		await waitForText(app, 'Wrote ');
		// The notice wraps at a space or after a `/` of the path: join its lines back.
		f = frame(app).replace(/\/\n/g, '/').replace(/\n/g, ' ');
		expect(f).toContain(`Wrote ${join(cwd, `${stem}.md`)}, .csv, .json and .svg`);
		for (const ext of formats) expect(existsSync(join(cwd, `${stem}.${ext}`))).toBe(true);
		expect(readdirSync(cwd).filter((n) => n.endsWith('.tmp'))).toEqual([]);
		const read = (ext: string) => readFileSync(join(cwd, `${stem}.${ext}`), 'utf8');
		const csv = parse(read('csv'), {columns: true}) as Record<string, string>[];
		expect(csv).toHaveLength(8);
		expect(csv.map((r) => r['layer2_cm'])).toEqual(['1', '2', '3', '4', '5', '6', '7', '8']);
		expect(csv[4]!['slider1_delta_db']).toBe('0');
		const json = JSON.parse(read('json'));
		expect(json.format).toBe('evenecho-table/1');
		expect(json.rows).toHaveLength(8);
		expect(json.caution).toBe(cautionLine);
		expect(XMLValidator.validate(read('svg'))).toBe(true);
		expect(read('md')).toContain('# Depth-gain protocol table');
		expect(read('md')).not.toMatch(/Generated/);

		// Again: asked before replacing the four; the same plan and list give the same bytes.
		const before = formats.map(read);
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Replace the 4 files already there? (y/n)');
		await press(app, 'y');
		await waitForText(app, 'Wrote ');
		expect(formats.map(read)).toEqual(before);

		// Back to step 5, on the sweep row; the list is kept for next time.
		await press(app, keys.escape);
		f = frame(app);
		expect(f).toContain('[5 Curve & save]');
		expect(f).not.toContain('Thicknesses, cm');
		expect(frame(app)).toContain('> [ Sweep over fat thickness ]');
		await press(app, keys.enter);
		expect(frame(app)).toContain('[1:8:1]');
	});

	it('says plainly when the plan has no fat layer, and exports nothing', async () => {
		const {app, cwd} = await open({plan: planWithoutFat()});
		await press(app, 'f');
		const f = frame(app);
		expect(f.replace(/\s+/g, ' ')).toContain(
			'the plan has no layer of tissue "fat", so there is no thickness to sweep',
		);
		expect(f).not.toContain('rows 1-');
		await press(app, 'e');
		expect(frame(app)).toContain('Nothing exported: the plan has no fat layer to sweep.');
		expect(frame(app)).not.toContain('Export to folder');
		expect(readdirSync(cwd)).toEqual([]);
	});

	it('opens with f from another step at 100 columns, showing every column', async () => {
		const {app} = await open({columns: 100, rows: 30});
		await press(app, '2', 'f');
		const f = frame(app);
		expect(f).toContain('[5 Curve & save]');
		expect(f).toContain('columns 1-13 of 13');
		expect(f).toContain('warnings');
		await press(app, keys.escape);
		expect(selectedLine(app)).toContain('[ Sweep over fat thickness ]');
	});

	it('lists the sweep keys in the help overlay, which still fits 80x24 whole', async () => {
		const {app} = await open();
		await press(app, 'f', '?');
		const f = frame(app);
		for (const b of bindings) expect(f, b.help).toContain(b.help);
		await press(app, keys.escape);
		expect(frame(app)).toContain('Thicknesses, cm');
	});
});
