/**
 * The console reuses a curve's physics (samples, band, noise floor, barrier) when an edit touches
 * only the slider bank or the master gain, and redoes the fit alone. Derived, no outside source:
 * the bank and the master gain enter the model only through the fit, so the reused curve must equal
 * the one worked out from nothing, field for field; any other edit must not reuse.
 */
import {describe, expect, it} from 'vitest';
import {computeCurve, curvePhysics, fitCurve, reusablePhysics} from '../../src/engine/compensation-curve.js';
import type {PlanDocument} from '../../src/plan/plan-schema.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';
import {abdomenPlan} from '../helpers/plans.js';

const base = abdomenPlan({}, 5);

const bankEdits: [string, (d: PlanDocument) => PlanDocument][] = [
	['slider count 12', (d) => ({...d, sliders: {...d.sliders, count: 12}})],
	['slider count 4', (d) => ({...d, sliders: {...d.sliders, count: 4}})],
	['knots at band edges', (d) => ({...d, sliders: {...d.sliders, knots: 'band-edges'}})],
	['narrow slider travel', (d) => ({...d, sliders: {...d.sliders, minDb: -3, maxDb: 3}})],
	['steeper built-in ramp', (d) => ({...d, sliders: {...d.sliders, rampDbPerCmMhz: 0.8}})],
	['master range', (d) => ({...d, masterGain: {...d.masterGain, minDb: 20, maxDb: 40}})],
];

const physicsEdits: [string, (d: PlanDocument) => PlanDocument][] = [
	['centre frequency', (d) => ({...d, probe: {...d.probe, centerMhz: d.probe.centerMhz + 0.1}})],
	['a layer thickness', (d) => ({...d, layers: d.layers.map((l, i) => (i === 1 ? {...l, thicknessCm: 5.1} : l))})],
	['display depth', (d) => ({...d, display: {...d.display, depthCm: 18}})],
	['noise budget', (d) => ({...d, noiseBudgetDb: 50})],
	['receive mode', (d) => ({...d, probe: {...d.probe, receive: 'tissue-harmonic'}})],
	['beam angle', (d) => ({...d, probe: {...d.probe, angleDeg: 10}})],
];

describe('reusing a curve’s physics', () => {
	const physics = curvePhysics(resolvePlan(base));
	for (const receive of ['fundamental', 'tissue-harmonic'] as const) {
		const doc = {...base, probe: {...base.probe, receive}};
		const own = curvePhysics(resolvePlan(doc));
		for (const [name, edit] of bankEdits) {
			it(`${receive}, ${name}: reused, and the curve equals the one worked out from nothing`, () => {
				const plan = resolvePlan(edit(doc));
				const reused = reusablePhysics(own, plan);
				expect(reused).toBe(own);
				expect(fitCurve(reused!, plan)).toEqual(computeCurve(plan));
			});
		}
	}
	for (const [name, edit] of physicsEdits) {
		it(`${name}: not reused`, () => {
			expect(reusablePhysics(physics, resolvePlan(edit(base)))).toBeUndefined();
		});
	}
	it('not reused for another sample step, without the band or without the samples', () => {
		const plan = resolvePlan(base);
		expect(reusablePhysics(physics, plan)).toBe(physics);
		expect(reusablePhysics(physics, plan, {stepCm: 0.2})).toBeUndefined();
		expect(reusablePhysics(physics, plan, {band: false})).toBeUndefined();
		expect(reusablePhysics(physics, plan, {samples: false})).toBeUndefined();
	});
});
