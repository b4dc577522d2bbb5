/** Older plans' harmonic flag and the receive mode of noise budgets (plan-migration.ts, resolve-plan.ts). */
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {migrateHarmonicFlag} from '../../src/plan/plan-migration.js';
import {parsePlan} from '../../src/plan/resolve-plan.js';

const layers = [
	{tissue: 'fat', thicknessCm: 2},
	{tissue: 'liver', thicknessCm: 20},
];

describe('the old harmonic flag', () => {
	it('true becomes tissue-harmonic receive, and a budget or phantom given with it is marked as harmonic', () => {
		expect(migrateHarmonicFlag({layers, probe: {centerMhz: 2.5, harmonic: true}, noiseBudgetDb: 70})).toEqual({
			layers,
			probe: {centerMhz: 2.5, receive: 'tissue-harmonic'},
			noiseBudgetDb: 70,
			noiseBudgetReceive: 'tissue-harmonic',
		});
		const cal = {centerMhz: 2.5, depthCm: 14, alphaDbPerCmMhz: 0.5};
		expect(
			migrateHarmonicFlag({layers, probe: {centerMhz: 2.5, harmonic: true}, phantomCalibration: cal}),
		).toMatchObject({
			phantomCalibration: {...cal, receive: 'tissue-harmonic'},
		});
	});

	it('false just goes (fundamental is the default); the input object is left alone', () => {
		const input = {layers, probe: {centerMhz: 2.5, harmonic: false}};
		expect(migrateHarmonicFlag(input)).toEqual({layers, probe: {centerMhz: 2.5}});
		expect(input.probe.harmonic).toBe(false);
	});

	it('a plan file with the old flag parses, with the mode carried into the engine plan', () => {
		const r = parsePlan({
			format: 'evenecho-plan/1',
			layers,
			probe: {centerMhz: 2.5, harmonic: true},
			noiseBudgetDb: 70,
		});
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.value.plan.probe.receive).toBe('tissue-harmonic');
		expect(r.value.plan.noiseBudgetReceive).toBe('tissue-harmonic');
		expect(computeCurve(r.value.plan).warnings.map((w) => w.code)).not.toContain('budget-receive-mismatch');
	});

	it('a bad receive mode is refused with the allowed values named', () => {
		const r = parsePlan({layers, probe: {centerMhz: 2.5, receive: 'loud'}});
		expect(r.ok).toBe(false);
		if (r.ok) return;
		expect(r.errors.join('\n')).toMatch(
			/probe\.receive: must be "fundamental", "tissue-harmonic" or "scatterer-harmonic"/,
		);
	});
});

describe('noise budgets carry their receive mode', () => {
	it('a plan switched to harmonic without a harmonic budget says so', () => {
		const r = parsePlan({layers, probe: {centerMhz: 2.5, receive: 'tissue-harmonic'}});
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		const w = computeCurve(r.value.plan).warnings.find((x) => x.code === 'budget-receive-mismatch');
		expect(w?.message).toMatch(/noise budget is for fundamental receive/);
	});

	it('a phantom reach measured in tissue-harmonic mode is worked out in that mode and raises no mismatch', () => {
		const cal = {centerMhz: 2.5, depthCm: 12, alphaDbPerCmMhz: 0.5};
		const harm = parsePlan({
			layers,
			probe: {centerMhz: 2.5, receive: 'tissue-harmonic'},
			phantomCalibration: {...cal, receive: 'tissue-harmonic'},
		});
		const fund = parsePlan({layers, probe: {centerMhz: 2.5, receive: 'tissue-harmonic'}, phantomCalibration: cal});
		expect(harm.ok && fund.ok).toBe(true);
		if (!harm.ok || !fund.ok) return;
		expect(harm.value.plan.noiseBudgetDb).not.toBeCloseTo(fund.value.plan.noiseBudgetDb, 1);
		expect(computeCurve(harm.value.plan).warnings.map((w) => w.code)).not.toContain('budget-receive-mismatch');
		expect(computeCurve(fund.value.plan).warnings.map((w) => w.code)).toContain('budget-receive-mismatch');
	});
});
