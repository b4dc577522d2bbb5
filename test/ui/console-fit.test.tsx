/**
 * Keystroke tests for how the console uses the terminal it has: the 80-column live line keeps the
 * noise floor and barrier in words, and at 120×40 the stack keeps α0 and n and the plot fills its height.
 * Layout checks only (no physics is asserted here; the depths come from the engine under test).
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {boneAndNoisePlanJson, planDocument} from '../helpers/plans.js';
import {frame, press, ready, send, waitForText, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

async function open(columns: number, rows: number, plan = planDocument(structuredClone(boneAndNoisePlanJson))) {
	const home = mkdtempSync(join(tmpdir(), 'evenecho-fit-'));
	dirs.push(home);
	const app = render(
		<App
			shelf={openShelf({home})}
			theme={plainTheme}
			exportDir={home}
			initialPlan={plan}
			columns={columns}
			rows={rows}
		/>,
	);
	apps.push(app);
	await ready(app);
	return app;
}

const lineWith = (app: Rendered, start: string) =>
	frame(app)
		.split('\n')
		.find((l) => l.startsWith(start)) ?? '';

describe('the 80-column live line', () => {
	it('keeps the noise floor and the barrier whole, dropping the fit and the Tab hint first', async () => {
		const app = await open(80, 24);
		await press(app, '2');
		const live = lineWith(app, 'Live:');
		expect(live.length).toBeLessThanOrEqual(80);
		expect(live).toMatch(/reach \d+\.\d cm, ~ noise below; # blocked from \d+\.\d cm/);
		expect(live).not.toContain('…');
	});
});

describe('120×40', () => {
	it('the stack pane shows a0 and n beside each layer, as at 80 columns', async () => {
		for (const [columns, rows] of [
			[120, 40],
			[80, 24],
		] as const) {
			const app = await open(columns, rows, demoPlan());
			await press(app, '2');
			const text = frame(app);
			expect(text, `${columns}×${rows}`).toMatch(/4 Liver +20\.0 cm true \+ +a0 0\.5 n 1\.1/);
			expect(text, `${columns}×${rows}`).toMatch(/3 Sk(eletal|\.) muscle, across +1\.2 cm true +a0 0\.96 n 1/);
			// a0 stands in one column on every layer row.
			const columnsOfA0 = text
				.split('\n')
				.filter((l) => /^[> ] \d /.test(l))
				.map((l) => l.indexOf(' a0 '));
			expect(new Set(columnsOfA0).size, `${columns}×${rows}`).toBe(1);
		}
	});

	it('on steps 1 to 4 the plot uses the height it has: no empty bottom third', async () => {
		const app = await open(120, 40, demoPlan());
		for (const step of ['1', '2', '3', '4']) {
			await send(app, step);
			const lines = frame(app).split('\n');
			const plotRows = lines.filter((l) => /^.{60,}\|.{10,}\|/.test(l)).length;
			expect(plotRows, `step ${step}`).toBeGreaterThanOrEqual(20);
			// The body ends above the hint line: count the blank lines just above it.
			const hint = lines.findIndex((l) => l.startsWith('↑↓'));
			let blank = 0;
			while (blank < hint && lines[hint - 1 - blank]!.trim() === '') blank++;
			expect(blank, `step ${step}`).toBeLessThan(3);
		}
	});

	it('the picture in place of the plot uses that height too', async () => {
		const app = await open(120, 40, demoPlan());
		await press(app, '2', 'p');
		await waitForText(app, 'Illustration');
		const lines = frame(app).split('\n');
		const hint = lines.findIndex((l) => l.startsWith('↑↓'));
		let blank = 0;
		while (blank < hint && lines[hint - 1 - blank]!.trim() === '') blank++;
		expect(blank).toBeLessThan(3);
	});
});
