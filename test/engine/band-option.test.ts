import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';
import {abdomenPlan} from '../helpers/plans.js';

// Derived: the band is drawn beside the curve and never enters the fit, so callers that do not show it
// (tables, the simulator, refine) may skip it and must get the same curve, sliders and master.
describe('computeCurve without the band', () => {
	for (const receive of ['fundamental', 'tissue-harmonic'] as const) {
		it(`${receive}: same curve and fit; lowDb = highDb = the curve`, () => {
			const doc = abdomenPlan({}, 3);
			const plan = resolvePlan({...doc, probe: {...doc.probe, receive}});
			const withBand = computeCurve(plan);
			const without = computeCurve(plan, {band: false});
			expect(without.fit).toEqual(withBand.fit);
			expect(without.penetrationDepthCm).toEqual(withBand.penetrationDepthCm);
			without.samples.forEach((s, i) => {
				expect(s.compensationDb).toBe(withBand.samples[i]!.compensationDb);
				expect(s.lowDb).toBe(s.compensationDb);
				expect(s.highDb).toBe(s.compensationDb);
			});
			// The band itself is real where it is asked for.
			expect(withBand.samples.some((s) => s.highDb - s.lowDb > 1)).toBe(true);
		});
	}
});
