/** The depth plot and the layout arithmetic, pure. */
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {parsePlan, resolvePlan} from '../../src/plan/resolve-plan.js';
import {depthPlot, glyph} from '../../src/ui/kit/depth-plot.js';
import {layoutFor, scrollWindow, wrapWords} from '../../src/ui/kit/layout.js';
import {boneAndNoisePlanJson} from '../helpers/plans.js';

function boneAndNoisePlan() {
	const r = parsePlan(structuredClone(boneAndNoisePlanJson));
	if (!r.ok) throw new Error(r.errors.join('; '));
	return r.value;
}

describe('depth plot', () => {
	it('has the asked size, depth down the rows and the dB axis across', () => {
		const plot = depthPlot(computeCurve(resolvePlan(demoPlan())), {width: 44, height: 12});
		// 16 cm in at most 12 rows: 1.5 cm a row, the last one from 15 cm.
		expect(plot.rows).toHaveLength(11);
		expect(plot.rows[1]).toMatch(/^\s+1\.5\|/);
		expect(plot.rows[10]).toMatch(/^\s+15\.0\|/);
		for (const line of [plot.axis, ...plot.rows, plot.legend]) expect(line.length).toBeLessThanOrEqual(44);
		expect(plot.rows.map((l) => l.indexOf('|', 6))).toEqual(plot.rows.map(() => plot.rows[0]!.indexOf('|', 6)));
		expect(plot.rows[0]).toMatch(/^\s+0\.0\|/);
		expect(plot.axis).toContain('dB');
		expect(plot.rows.join('\n')).toContain(glyph.curve);
		expect(plot.rows.join('\n')).toContain(glyph.slider);
	});

	it('marks the noise floor and the blocked depth with characters, not colour', () => {
		const {plan} = boneAndNoisePlan();
		const r = computeCurve(plan);
		expect(r.penetrationDepthCm).toBeLessThan(r.blockedDepthCm!);
		const plot = depthPlot(r, {width: 50, height: 16});
		const text = plot.rows.join('\n');
		expect(text).toContain('~ noise');
		expect(text).toContain('# blocked');
		// Rows below the barrier have a # background, rows between the noise floor and it a ~ background.
		expect(plot.rows[15]).toMatch(/\|#+/);
		expect(plot.rows[7]).toMatch(/\|~/);
		expect(plot.legend).toContain('~ noise');
		expect(plot.legend).toContain('# blocked');
	});

	it('draws the selected slider as @', () => {
		const plot = depthPlot(computeCurve(resolvePlan(demoPlan())), {width: 44, height: 12, selectedSlider: 3});
		expect(plot.rows.join('').split(glyph.selected)).toHaveLength(2);
	});
});

describe('plot rows', () => {
	it('use round depth steps when they fit', async () => {
		const {plotRowCount} = await import('../../src/ui/kit/depth-plot.js');
		expect(plotRowCount(16, 16)).toBe(16);
		// 0.8 cm a row: 20 of 21 rows, where whole centimetres left five rows empty.
		expect(plotRowCount(16, 21)).toBe(20);
		expect(plotRowCount(16, 14)).toBe(14);
		expect(plotRowCount(7.3, 13)).toBe(13);
	});

	it('stretch over every row offered when no round step fills most of them, labelled at round depths', async () => {
		const {plotRowCount} = await import('../../src/ui/kit/depth-plot.js');
		expect(plotRowCount(16, 26)).toBe(26);
		expect(plotRowCount(20, 13)).toBe(13);
		const plot = depthPlot(computeCurve(resolvePlan(demoPlan())), {width: 54, height: 26});
		expect(plot.rows).toHaveLength(26);
		const labels = plot.rows.map((l) => l.slice(0, 5).trim()).filter(Boolean);
		expect(labels).toEqual(Array.from({length: 16}, (_, k) => k.toFixed(1)));
	});
});

describe('layout', () => {
	it('puts step and curve side by side from 100 columns', () => {
		expect(layoutFor(99, 30).isWide).toBe(false);
		const wide = layoutFor(100, 30);
		expect(wide.isWide).toBe(true);
		expect(wide.stepWidth + 1 + wide.curveWidth).toBe(100);
	});

	it('keeps the frame a line shorter than the terminal at 80x24', () => {
		const l = layoutFor(80, 24);
		expect(1 + l.bodyRows + 2 + l.cautionRows).toBeLessThanOrEqual(23);
		expect(l.plotWidth).toBeLessThan(80);
	});

	it('scrolls a long list so the cursor stays in view', () => {
		expect(scrollWindow(5, 4, 10)).toEqual({start: 0, end: 5});
		expect(scrollWindow(30, 29, 10)).toEqual({start: 20, end: 30});
		expect(scrollWindow(30, 12, 10)).toEqual({start: 7, end: 17});
	});

	it('wraps words to a width', () => {
		expect(wrapWords('one two three four', 9)).toEqual(['one two', 'three', 'four']);
	});
});
