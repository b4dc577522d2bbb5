/** The tests' plan builders: engine plans from layers, plan documents from the invented fixtures (not clinical data). */
import {libraryTissue} from '../../src/engine/tissue-library.js';
import type {EnginePlan, Layer, Tissue} from '../../src/engine/types.js';
import {parsePlanDocument, type PlanDocument} from '../../src/plan/plan-schema.js';
import {abdomenPlanJson} from '../fixtures/plans.js';

export {abdomenPlanJson, boneAndNoisePlanJson} from '../fixtures/plans.js';

/** A plan document from plan-file JSON; throws with the schema's messages when it does not validate. */
export function planDocument(json: unknown): PlanDocument {
	const r = parsePlanDocument(json);
	if (!r.ok) throw new Error(r.errors.join('; '));
	return r.value;
}

/** The invented upper-abdomen plan as a document (see test/fixtures/plans.ts). */
export function abdomenPlan(overrides: object = {}, fatCm?: number): PlanDocument {
	return planDocument(abdomenPlanJson(overrides, fatCm));
}

export function tissue(id: string): Tissue {
	const t = libraryTissue(id);
	if (!t) throw new Error(`no tissue ${id}`);
	return t;
}

export function custom(
	label: string,
	speedMps: number,
	densityKgM3: number,
	alphaDbPerCmMhz: number,
	exponent = 1,
): Tissue {
	return {label, speedMps, densityKgM3, alphaDbPerCmMhz, exponent};
}

/** Density that gives impedance `zMrayl` at speed `c`, so boundaries reflect nothing. */
export function matched(label: string, speedMps: number, alphaDbPerCmMhz: number, exponent = 1, zMrayl = 1.6): Tissue {
	return custom(label, speedMps, (zMrayl * 1e6) / speedMps, alphaDbPerCmMhz, exponent);
}

/** A power-spectrum σ (MHz) expressed as the plan's −6 dB fractional bandwidth. */
export function bandwidthForSigma(centerMhz: number, sigmaMhz: number): number {
	return (sigmaMhz * 2 * Math.sqrt(1.2 * Math.log(10))) / centerMhz;
}

export function plan(
	layers: Layer[],
	overrides: Partial<EnginePlan> & {centerMhz?: number; bandwidthFraction?: number; depthCm?: number} = {},
): EnginePlan {
	const {centerMhz = 3.5, bandwidthFraction = 0, depthCm = 16, ...rest} = overrides;
	return {
		name: 'test plan',
		region: 'test',
		layers,
		probe: {centerMhz, bandwidthFraction, receive: 'fundamental'},
		scattererExponent: 0,
		display: {depthCm, assumedSpeedMps: 1540},
		sliders: {count: 8, minDb: -15, maxDb: 15, knots: 'band-centres', ends: 'flat', rampDbPerCmMhz: 0},
		masterGain: {minDb: 0, maxDb: 60, baseDb: 30},
		noiseBudgetDb: 200,
		...rest,
	};
}
