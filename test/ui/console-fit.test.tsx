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
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {boneAndNoisePlanJson, planDocument} from '../helpers/plans.js';
import {frame, press, ready, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

async function open(columns: number, rows: number, plan = planDocument(structuredClone(boneAndNoisePlanJson))) {
	const home = mkdtempSync(join(tmpdir(), 'evenecho-fit-'));
	dirs.push(home);
	const app = render(<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} initialPlan={plan} columns={columns} rows={rows} />);
	apps.push(app);
	await ready(app);
	return app;
}

const lineWith = (app: Rendered, start: string) => frame(app).split('\n').find((l) => l.startsWith(start)) ?? '';

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
