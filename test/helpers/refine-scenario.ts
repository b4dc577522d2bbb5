/** The invented refine scenario shared by the image-analysis tests: a standard adult upper abdomen
 * whose liver attenuates more or less than the library says (simulated, truth known). */
import {computeCurve} from '../../src/engine/compensation-curve.js';
import type {EnginePlan} from '../../src/engine/types.js';
import {settingsOfFit} from '../../src/analysis/applied-gain.js';
import {withLayerAlpha} from '../../src/analysis/attenuation-fit.js';
import {parsePlan} from '../../src/plan/resolve-plan.js';
import {abdomenPlanJson} from '../fixtures/plans.js';
import {mulberry32} from '../../src/simulate/seeded-random.js';
import {speckleFrame, type FrameOptions} from './speckle-frame.js';

export function scenarioPlan(overrides: Record<string, unknown> = {}): EnginePlan {
	const r = parsePlan(abdomenPlanJson(overrides));
	if (!r.ok) throw new Error(r.errors.join('; '));
	return r.value.plan;
}

export const liverLayer = 3;

/** Case k: the liver's true α0, whether a cyst and a bright line cross the measured columns. */
export function scenarioCase(k: number) {
	const rnd = mulberry32(1000 + k);
	const factor = 0.7 + 1.1 * rnd();
	return {alpha: 0.5 * factor, cyst: k % 2 === 1, line: k % 3 === 0};
}

export function scenarioFrame(plan: EnginePlan, k: number, extra: Partial<FrameOptions> = {}) {
	const c = scenarioCase(k);
	const truth = withLayerAlpha(plan, liverLayer, c.alpha);
	const applied = settingsOfFit(computeCurve(plan).fit);
	const image = speckleFrame({
		plan,
		truth,
		applied,
		seed: 7 + 31 * k,
		cyst: c.cyst ? {depthCm: 6 + (k % 5), x: 0.45 + 0.02 * (k % 5), radiusCm: 0.8} : undefined,
		line: c.line ? {depthCm: 4.5 + (k % 4), from: 0.32, to: 0.62, px: 2, db: 20} : undefined,
		...extra,
	});
	return {...image, truthAlpha: c.alpha, applied};
}
