/**
 * Every row label on every step reads whole at 80x24 and 100x30: the cursor is walked over each
 * row of steps 1 to 5, an open layer (with a measured a0 and its interval rows) and step 3 with
 * the target following a layer, and the selected row's label never ends in the cut mark `…`.
 * Long labels are shortened deliberately in their own words (or by the kit's short forms), never
 * cut. Behaviour of the screen only; no physics is asserted.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {abbreviate} from '../../src/ui/kit/text-fit.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {keys} from '../helpers/keys.js';
import {frame, moveTo, press, ready, send, type, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

async function open(columns: number, rows: number) {
	const home = mkdtempSync(join(tmpdir(), 'evenecho-labels-'));
	dirs.push(home);
	const app = render(
		<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={columns} rows={rows} />,
	);
	apps.push(app);
	await ready(app);
	return app;
}

/** The row under the cursor, wherever it sits on the line (at 80 columns step 5's actions are beside the plot). */
function markedRow(app: Rendered): string {
	for (const line of frame(app).split('\n')) {
		// The mark starts the line or follows a gap (not the `>` of a title like "stack > layer 2").
		const m = /(?:^\s*|\s{2})>\s+(\S.*)$/.exec(line);
		if (m) return m[1]!;
	}
	return '';
}

/** The label: the row's text up to the first gap of two blanks (labels are padded, values follow). */
const labelOf = (row: string) => row.split(/\s{2,}/)[0]!;

/** Walks the cursor from the top of the current list to its end, returning each row's label. */
async function walkLabels(app: Rendered): Promise<string[]> {
	for (let i = 0; i < 40; i++) await send(app, keys.up);
	const seen: string[] = [];
	let last = '';
	for (let i = 0; i < 40; i++) {
		const row = markedRow(app);
		if (row === last) break;
		seen.push(labelOf(row));
		last = row;
		await send(app, keys.down);
	}
	return seen;
}

describe('every row label is whole', () => {
	for (const [columns, rows] of [
		[80, 24],
		[100, 30],
	] as const) {
		it(`at ${columns}x${rows}, on steps 1 to 5, an open layer and a target following a layer`, async () => {
			const app = await open(columns, rows);
			const labels: string[] = [];
			for (const step of ['1', '2', '3', '4', '5']) {
				await send(app, step);
				labels.push(...(await walkLabels(app)));
			}
			// An open layer with an a0 measured for this patient: its interval rows show too.
			await press(app, '2');
			await moveTo(app, keys.up, '2 Fat');
			await press(app, keys.enter);
			await moveTo(app, keys.down, 'a0 measured');
			await press(app, keys.enter);
			await type(app, '0.7');
			await press(app, keys.enter);
			labels.push(...(await walkLabels(app)));
			// The target following layer 4: its depth row is named after that layer.
			await press(app, keys.escape, '3');
			await moveTo(app, keys.up, 'Target layer (0 = fixed)');
			await press(app, keys.enter);
			await type(app, '4');
			await press(app, keys.enter);
			labels.push(...(await walkLabels(app)));

			for (const label of labels) expect(label, `a cut label at ${columns} columns`).not.toContain('…');
			// A label filling its column exactly is followed by one blank, then the value.
			for (const whole of [
				'Target layer (0 = fixed)',
				'Target below layer 4 top',
				'Target depth (= display)',
				'a0 measured (0 = none)',
				'[ Refine from an image ]',
			]) {
				expect(
					labels.some((l) => l === whole || l.startsWith(`${whole} `)),
					whole,
				).toBe(true);
			}
			expect(labels.length).toBeGreaterThan(40);
		}, 60_000);
	}

	it('shortens by the kit short forms, not by a cut: a two-digit layer, a long template name', () => {
		expect(abbreviate('Target below layer 12 top', 24)).toBe('Target below L12 top');
		expect(abbreviate('Paediatric abdomen – liver, thin body wall', 41)).toBe('Paed. abdomen – liver, thin body wall');
	});
});
