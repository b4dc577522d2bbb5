/**
 * The gain the simulated scanner applies to each row: its depth response (built-in ramp or a
 * measured/invented response) + master gain above its reference + the sliders interpolated by the
 * scanner's hat basis (the engine's own, so the picture and the plan agree).
 */
import {appliedGainDb, knotDepths} from '../engine/slider-basis.js';
import type {EnginePlan, SliderFit} from '../engine/types.js';
import type {ScannerBehaviour} from './scanner-behaviour.js';

/** Sliders in dB at their knots and the master gain on the scanner's displayed scale. */
export interface AppliedSettings {
	readonly sliderDb: readonly number[];
	readonly masterGainDb: number;
}

/** Every slider centred, master at the scanner's reference: the scanner's depth response alone. */
export function centredSettings(plan: EnginePlan, scanner: ScannerBehaviour): AppliedSettings {
	return {sliderDb: new Array<number>(plan.sliders.count).fill(0), masterGainDb: scanner.referenceMasterDb};
}

/** The plan's fitted sliders and master gain. */
export function settingsOfFit(fit: SliderFit): AppliedSettings {
	return {sliderDb: fit.sliders.map((s) => s.gainDb), masterGainDb: fit.masterGainDb};
}

/** Gain per row, dB, relative to the reference echo at the skin at the reference master. */
export function rowGainsDb(
	plan: EnginePlan,
	scanner: ScannerBehaviour,
	settings: AppliedSettings,
	depthCm: Float64Array,
): Float64Array {
	const knots = knotDepths(plan.sliders, plan.display.depthCm);
	const out = new Float64Array(depthCm.length);
	for (let r = 0; r < depthCm.length; r++) {
		const d = Math.max(0, depthCm[r]!);
		const controls = appliedGainDb(knots, plan.sliders.ends, settings.sliderDb, settings.masterGainDb, d);
		out[r] = scanner.depthResponseDb(d) + controls - scanner.referenceMasterDb;
	}
	return out;
}
