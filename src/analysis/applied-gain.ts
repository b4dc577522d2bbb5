/**
 * What the scanner delivered when the image was taken, and what the plan therefore expects the
 * image to show: level(z) = delivered gain(z) − loss(z), in dB relative to the reference scatterer
 * right under the skin at the plan's base master gain (plus an offset the image sets: the display's
 * zero and the tissue's own echogenicity).
 */
import {builtInRampDb} from '../engine/compensation-curve.js';
import {appliedGainDb, knotDepths} from '../engine/slider-basis.js';
import type {EnginePlan, SliderFit} from '../engine/types.js';

/** The settings an image was taken with: slider values (dB) and the master on the scanner's scale. */
export interface AppliedSettings {
	readonly slidersDb: readonly number[];
	readonly masterGainDb: number;
}

/** The scanner's own depth gain with the sliders centred, dB at a displayed depth (relative to the skin). */
export type OwnDepthGain = (plan: EnginePlan, displayedCm: number) => number;

/** Without a profile: the slider bank's assumed built-in ramp. */
export const assumedRamp: OwnDepthGain = builtInRampDb;

export function settingsOfFit(fit: SliderFit): AppliedSettings {
	return {slidersDb: fit.sliders.map((s) => s.gainDb), masterGainDb: fit.masterGainDb};
}

/** Gain delivered at a displayed depth relative to the plan's skin level, dB. */
export function deliveredGainDb(
	plan: EnginePlan,
	settings: AppliedSettings,
	own: OwnDepthGain,
	displayedCm: number,
): number {
	const knots = knotDepths(plan.sliders, plan.display.depthCm);
	return (
		own(plan, displayedCm) +
		appliedGainDb(knots, plan.sliders.ends, settings.slidersDb, settings.masterGainDb, displayedCm) -
		plan.masterGain.baseDb
	);
}

/** Depths at which a band's model values are averaged (its rows are averaged alike). */
export function bandSampleDepths(topCm: number, bottomCm: number, count = 3): number[] {
	return Array.from({length: count}, (_, i) => topCm + ((i + 0.5) * (bottomCm - topCm)) / count);
}

export function meanOver(depths: readonly number[], f: (d: number) => number): number {
	let s = 0;
	for (const d of depths) s += f(d);
	return s / depths.length;
}
