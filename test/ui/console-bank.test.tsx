/**
 * Keystroke tests for the slider bank beside the step-5 table: one track per slider, skin at the
 * top, the knob where the plan sets it, `|` at the centre detent (0 dB offset: the scanner's own
 * ramp with the slider centred; common practice, no source), `@` on the chosen slider; in
 * fractions of full travel when the plan names a measured scanner profile.
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
import {knobAt, sliderBank} from '../../src/ui/plot/slider-bank.js';
import {keys} from '../helpers/keys.js';
import {frame, press, ready, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

describe('slider bank', () => {
	it('puts the knob at the ends for the range ends and on the detent for 0', () => {
		expect(knobAt(-15, -15, 15, 21)).toBe(0);
		expect(knobAt(15, -15, 15, 21)).toBe(20);
		expect(knobAt(0, -15, 15, 21)).toBe(10);
		expect(knobAt(40, -15, 15, 21)).toBe(20);
	});

	it('draws one track per slider in dB, and in travel with a measured scanner', () => {
		const curve = computeCurve(resolvePlan(demoPlan()));
		const bank = sliderBank(curve, 21, 2);
		expect(bank.rows).toHaveLength(curve.fit.sliders.length);
		expect(bank.header).toMatch(/^-15 +\+15 dB$/);
		curve.fit.sliders.forEach((s, k) => {
			const row = bank.rows[k]!;
			expect(row).toHaveLength(23);
			expect(row.indexOf(k === 2 ? '@' : 'o') - 1).toBe(knobAt(s.gainDb, -15, 15, 21));
		});
		const withTravel = {
			...curve,
			plan: {...curve.plan, scanner: {id: 'x', label: 'invented scanner', sliderTravelDb: 10} as never},
		};
		const travel = sliderBank(withTravel, 21);
		expect(travel.header).toMatch(/^-1 +\+1 travel$/);
		expect(travel.rows[7]!.indexOf('o') - 1).toBe(knobAt(curve.fit.sliders[7]!.gainDb / 10, -1, 1, 21));
	});

	it('stands beside the table on step 5 at 120 columns, the chosen slider as @', async () => {
		const home = mkdtempSync(join(tmpdir(), 'evenecho-bank-'));
		dirs.push(home);
		const app = render(<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={120} rows={40} />);
		apps.push(app);
		await ready(app);
		await press(app, '5');
		const lines = frame(app).split('\n');
		expect(lines.some((l) => /# depth slider +comp vs usual +-15 +\+15 dB/.test(l))).toBe(true);
		const tracks = lines.filter((l) => /^[> ] +\d+ .*\[[.|o@]+\]/.test(l));
		expect(tracks).toHaveLength(8);
		expect(tracks[0]).toMatch(/^>.*\[[.|o]*@[.|o]*\]/);
		await press(app, keys.down);
		expect(
			frame(app)
				.split('\n')
				.filter((l) => /\[[.|o]*@[.|o]*\]/.test(l))[0],
		).toMatch(/^> +2 /);
	});
});
