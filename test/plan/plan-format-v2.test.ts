/**
 * evenecho-plan/2: thickness measured on screen or true, a target that follows a layer, a
 * measured α0, and /1 files read with their old meaning.
 *
 * Depth mapping: the scanner draws an echo at c0·t/2 (the range equation; Szabo 2004, ch. 1, from
 * memory), so a layer of speed c is drawn c0/c times its true thickness. Worked example: 8 cm of fat
 * (1440 m/s) at an assumed 1540 m/s is drawn 8 × 1540/1440 = 8.56 cm; 8 cm measured on screen is
 * 8 × 1440/1540 = 7.48 cm of tissue.
 */
import {describe, expect, it} from 'vitest';
import {layerSpans} from '../../src/engine/layer-geometry.js';
import {migratePlanV1} from '../../src/plan/plan-migration.js';
import {parsePlanDocument, planFormat} from '../../src/plan/plan-schema.js';
import {describeTarget, targetDepthOf} from '../../src/plan/plan-target.js';
import {measuredAlphaSource, resolvePlan} from '../../src/plan/resolve-plan.js';
import {buildTable} from '../../src/table/sweep-runner.js';

const v1 = {
	format: 'evenecho-plan/1',
	name: 'Invented: Bed 3, Ward Wren',
	layers: [
		{tissue: 'skin', thicknessCm: 0.2},
		{tissue: 'fat', thicknessCm: 8},
		{tissue: 'muscle', thicknessCm: 1},
		{tissue: 'liver', thicknessCm: 16},
	],
	probe: {centerMhz: 3.5},
	display: {depthCm: 20},
	targetDepthCm: 18,
};

function parsed(input: unknown) {
	const r = parsePlanDocument(input);
	if (!r.ok) throw new Error(r.errors.join('\n'));
	return r.value;
}

describe('migration from evenecho-plan/1', () => {
	it('is one function that marks every thickness as true and changes nothing else', () => {
		const m = migratePlanV1(v1) as Omit<typeof v1, 'layers'> & {
			layers: {tissue: string; thicknessCm: number; thicknessAs: string}[];
		};
		expect(m.format).toBe('evenecho-plan/2');
		expect(m.layers.map((l) => l.thicknessAs)).toEqual(['true', 'true', 'true', 'true']);
		expect({...m, format: v1.format, layers: m.layers.map(({thicknessAs: _, ...l}) => l)}).toEqual(v1);
		expect(migratePlanV1({...v1, format: planFormat})).toEqual({...v1, format: planFormat});
	});

	it('a /1 file gives exactly the geometry it gave before: 8 cm of fat drawn 8.56 cm', () => {
		const plan = resolvePlan(parsed(v1));
		expect(plan.layers[1]!.thicknessCm).toBe(8);
		const spans = layerSpans(plan.layers, 1540);
		expect(spans[1]!.shownBottomCm - spans[1]!.shownTopCm).toBeCloseTo((8 * 1540) / 1440, 6);
	});
});

describe('thickness measured on the screen', () => {
	it('8 cm of fat measured on screen is drawn 8 cm and is 7.48 cm of tissue', () => {
		const doc = parsed({...v1, format: planFormat, layers: v1.layers.map((l) => ({...l, thicknessAs: 'displayed'}))});
		const plan = resolvePlan(doc);
		expect(plan.layers[1]!.thicknessCm).toBeCloseTo((8 * 1440) / 1540, 9);
		const spans = layerSpans(plan.layers, 1540);
		expect(spans[1]!.shownBottomCm - spans[1]!.shownTopCm).toBeCloseTo(8, 9);
	});

	it('converts through the plan assumed speed', () => {
		const doc = parsed({
			...v1,
			format: planFormat,
			display: {depthCm: 20, assumedSpeedMps: 1600},
			layers: [
				{tissue: 'fat', thicknessCm: 4, thicknessAs: 'displayed'},
				{tissue: 'liver', thicknessCm: 5},
			],
		});
		expect(resolvePlan(doc).layers[0]!.thicknessCm).toBeCloseTo((4 * 1440) / 1600, 9);
	});

	it('refuses an unknown mode, naming the field and the choices', () => {
		const r = parsePlanDocument({
			...v1,
			format: planFormat,
			layers: [{tissue: 'fat', thicknessCm: 2, thicknessAs: 'screen'}],
		});
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.errors).toContain('layers.0.thicknessAs: must be "true" or "displayed"');
	});
});

describe('a target that follows a layer', () => {
	const rel = {...v1, format: planFormat, targetDepthCm: undefined, targetBelowLayer: {layer: 4, depthCm: 10}};

	it('sits N displayed cm below the displayed top of layer K', () => {
		const doc = parsed(rel);
		const plan = resolvePlan(doc);
		const top = 0.2 * (1540 / 1610) + 8 * (1540 / 1440) + 1 * (1540 / 1580);
		expect(targetDepthOf(doc, plan)).toBeCloseTo(top + 10, 9);
		expect(describeTarget(doc, () => 'Liver')).toBe('10 cm below the top of layer 4 (Liver)');
	});

	it('moves deeper row by row in a fat sweep, and the ladder column follows it', () => {
		const t = buildTable(parsed(rel), {fatCm: [1, 4, 8], freqMhz: [3.5]});
		const targets = t.rows.map((r) => r.targetDepthCm);
		expect(targets[1]! - targets[0]!).toBeCloseTo(3 * (1540 / 1440), 9);
		expect(targets[2]! - targets[1]!).toBeCloseTo(4 * (1540 / 1440), 9);
		expect(t.sweep.targetFollowsLayer).toBe(true);
		const absolute = buildTable(parsed({...v1, targetDepthCm: 18}), {fatCm: [1, 4, 8], freqMhz: [3.5]});
		expect(new Set(absolute.rows.map((r) => r.targetDepthCm))).toEqual(new Set([18]));
	});

	it('refuses a layer the plan does not have, and both kinds of target at once', () => {
		const bad = parsePlanDocument({...rel, targetBelowLayer: {layer: 9, depthCm: 1}});
		expect(bad.ok).toBe(false);
		if (!bad.ok)
			expect(bad.errors).toContain(
				"targetBelowLayer.layer: must name one of the plan's layers (1 = just under the skin)",
			);
		const both = parsePlanDocument({...rel, targetDepthCm: 12});
		expect(both.ok).toBe(false);
		if (!both.ok)
			expect(both.errors).toContain('targetBelowLayer: give either targetDepthCm or targetBelowLayer, not both');
	});
});

describe('α0 measured for this patient', () => {
	const measured = {alphaDbPerCmMhz: 0.82, lowDbPerCmMhz: 0.74, highDbPerCmMhz: 0.9};
	const doc = parsed({
		...v1,
		format: planFormat,
		layers: v1.layers.map((l, i) => (i === 3 ? {...l, measuredAlpha: measured} : l)),
	});

	it('replaces the library value and spread, keeps n, and says so in the source line', () => {
		const liver = resolvePlan(doc).layers[3]!.tissue;
		expect(liver.alphaDbPerCmMhz).toBe(0.82);
		expect(liver.spread?.alphaDbPerCmMhz).toEqual([0.74, 0.9]);
		expect(liver.exponent).toBe(1.1);
		expect(liver.source).toContain(measuredAlphaSource);
		expect(measuredAlphaSource).toBe('measured for this patient');
	});

	it('refuses an interval that does not hold the value', () => {
		const r = parsePlanDocument({
			...v1,
			layers: [
				{tissue: 'liver', thicknessCm: 2, measuredAlpha: {alphaDbPerCmMhz: 1, lowDbPerCmMhz: 0.5, highDbPerCmMhz: 0.8}},
			],
		});
		expect(r.ok).toBe(false);
		if (!r.ok)
			expect(r.errors[0]).toMatch(/^layers\.0\.measuredAlpha\.alphaDbPerCmMhz: the interval must hold the value/);
	});

	it('a swapped-in tissue in a table does not inherit the measurement', () => {
		const t = buildTable(doc, {swaps: [{layer: 4, choices: [{tissue: 'liver'}, {tissue: 'spleen'}]}]});
		for (const r of t.rows) expect(r.plan.layers[3]!.tissue.source).not.toContain(measuredAlphaSource);
	});
});
