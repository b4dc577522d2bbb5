/**
 * How the simulated scanner turns echo levels into grey: its own depth response (the gain it
 * applies with every slider centred), the master gain's reference, slider travel, its noise, and
 * its display chain. Two kinds:
 * - `plainScanner`: exactly the planner's own assumptions (the plan's built-in ramp, a purely
 *   logarithmic grey map, no processing) — the picture of a plan;
 * - `realisticScanner`: behaves like a machine rather than like the planner — a depth response
 *   with a focal hump, a grey map that is not purely logarithmic, mild smoothing after compression,
 *   and a border with burned-in text around the image region. Demo images use it, so a reader
 *   that ignores the region calibration or assumes a log map gets it wrong.
 */
import {builtInRampDb, pathModelOf} from '../engine/compensation-curve.js';
import type {EnginePlan} from '../engine/types.js';

export interface DisplayMap {
	/** Displayed level (dB) shown at full white before the curve. */
	readonly topDb: number;
	/** Levels from topDb − dynamicRangeDb to topDb span the grey scale. */
	readonly dynamicRangeDb: number;
	/** grey = 255·u^exponent with u the linear position in the range; 1 = purely logarithmic. */
	readonly curveExponent: number;
}

export interface ScannerBehaviour {
	readonly kind: 'plain' | 'realistic';
	/** Gain the scanner applies with every slider centred, dB at a displayed depth (cm). */
	readonly depthResponseDb: (depthCm: number) => number;
	/** Master gain at which the reference echo at the skin shows at 0 dB before the display map. */
	readonly referenceMasterDb: number;
	/** dB that one slider at full travel (position 1) adds at its knot. */
	readonly sliderTravelDb: number;
	/** Largest round-trip loss the scanner still lifts above its noise, dB (echo-to-noise 0 dB). */
	readonly noiseBudgetDb: number;
	readonly display: DisplayMap;
	/** FWHM in pixels of the blur applied to grey after compression; 0 = none. */
	readonly smoothingPx: number;
	/** Whether a border and burned-in text surround the image region. */
	readonly framed: boolean;
}

/** Default dynamic range of the display map, dB (the default). */
export const defaultDynamicRangeDb = 60;
/** The reference echo at the skin sits 28 dB below white, mid-grey on a 60 dB map (C45 in the
 * shared derivations: mean grey 125). */
export const defaultTopDb = 28;

/** The planner's own model of the scanner: the picture of a plan. */
export function plainScanner(plan: EnginePlan, dynamicRangeDb = defaultDynamicRangeDb): ScannerBehaviour {
	return {
		kind: 'plain',
		depthResponseDb: (d) => builtInRampDb(plan, d),
		referenceMasterDb: plan.masterGain.baseDb,
		sliderTravelDb: plan.sliders.maxDb,
		noiseBudgetDb: plan.noiseBudgetDb,
		display: {topDb: defaultTopDb, dynamicRangeDb, curveExponent: 1},
		smoothingPx: 0,
		framed: false,
	};
}

/** Invented machine constants of the realistic scanner, stated in every truth file. */
export const realisticConstants = {
	/** Its own ramp slope, dB/cm/MHz one way: below the planner's 0.5, as no real ramp is exact. */
	rampDbPerCmMhz: 0.4,
	/** Transmit-focus hump: peak gain, depth as a fraction of the display, 1/e half-width fraction. */
	focusHumpDb: 7,
	focusAtFraction: 0.4,
	focusWidthFraction: 0.22,
	referenceMasterDb: 30,
	sliderTravelDb: 12,
	/** The phantom's echo-to-noise reaches 0 dB at this fraction of the display depth. */
	penetrationFraction: 0.78,
	topDb: 30,
	curveExponent: 0.7,
	smoothingPx: 1.5,
} as const;

/** Uniform reference phantom used for the scanner's noise and by the phantom series: α0 0.5
 * dB/cm/MHz, linear in f, 1540 m/s (the standard tissue-mimicking value, IEC 61391-2 via the
 * shared reference; secondary). */
export function phantomPlan(plan: EnginePlan): EnginePlan {
	return {
		...plan,
		name: 'uniform reference phantom',
		layers: [
			{
				tissue: {label: 'reference phantom', speedMps: 1540, densityKgM3: 1050, alphaDbPerCmMhz: 0.5, exponent: 1},
				thicknessCm: 100,
			},
		],
		scattererExponent: 0,
		display: {...plan.display, assumedSpeedMps: 1540},
	};
}

/** The realistic scanner for a plan's probe and display depth. */
export function realisticScanner(plan: EnginePlan, dynamicRangeDb = defaultDynamicRangeDb): ScannerBehaviour {
	const c = realisticConstants;
	const depthCm = plan.display.depthCm;
	const harmonic = (plan.probe.receive ?? 'fundamental') !== 'fundamental';
	const legsMhz = harmonic ? 3 * plan.probe.centerMhz : 2 * plan.probe.centerMhz;
	const focus = c.focusAtFraction * depthCm;
	const width = c.focusWidthFraction * depthCm;
	const noiseBudgetDb = pathModelOf(phantomPlan(plan)).lossAt(c.penetrationFraction * depthCm);
	return {
		kind: 'realistic',
		depthResponseDb: (d) => c.rampDbPerCmMhz * legsMhz * d + c.focusHumpDb * Math.exp(-(((d - focus) / width) ** 2)),
		referenceMasterDb: c.referenceMasterDb,
		sliderTravelDb: c.sliderTravelDb,
		noiseBudgetDb,
		display: {topDb: c.topDb, dynamicRangeDb, curveExponent: c.curveExponent},
		smoothingPx: c.smoothingPx,
		framed: true,
	};
}
