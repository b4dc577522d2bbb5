/**
 * The slider bank at 80 columns: on the curve step the picture key cycles plot → this plan's
 * picture → the ramp's → the bank → plot, the bank standing where the plot was, one track per
 * slider with the knob where the fitted gain puts it. Behaviour of the screen; the knob positions
 * are checked against the plan's own fit (computeCurve), no outside physics is asserted.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {sliderBank} from '../../src/ui/plot/slider-bank.js';
import {frame, press, ready, waitForText, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

describe('slider bank at 80 columns', () => {
	it('the picture key on the curve step cycles to the bank in place of the plot, and back', async () => {
		const home = mkdtempSync(join(tmpdir(), 'evenecho-bank80-'));
		dirs.push(home);
		const app = render(<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={80} rows={24} />);
		apps.push(app);
		await ready(app);
		await press(app, '5');
		expect(frame(app)).not.toContain('Sliders as a bank');
		await press(app, 'p', 'p', 'p');
		await waitForText(app, 'Sliders as a bank, dB offsets (p: next)');
		const f = frame(app);
		const lines = f.split('\n');
		for (const line of lines) expect(line.length).toBeLessThanOrEqual(80);
		// Each slider's track as the bank draws it for this plan, beside its number and depth; the table stays.
		const curve = computeCurve(resolvePlan(demoPlan()));
		const bank = sliderBank(curve, 31, 0);
		curve.fit.sliders.forEach((s, k) => {
			const row = `${String(k + 1).padStart(2)} ${s.depthCm.toFixed(1).padStart(5)} ${bank.rows[k]}`;
			expect(
				lines.some((l) => l.startsWith(row)),
				row,
			).toBe(true);
		});
		expect(f).toContain('# depth slider');
		expect(f).toContain('Starting point only, not a diagnosis');
		await press(app, 'p');
		expect(frame(app)).not.toContain('Sliders as a bank');
		expect(frame(app)).toContain('* need');
	});
});
