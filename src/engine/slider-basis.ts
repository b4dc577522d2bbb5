/**
 * How a bank of depth sliders becomes a gain curve over displayed depth.
 *
 * The scanner interpolates linearly between slider knots (a "hat" basis: each slider's weight is 1
 * at its own knot and falls linearly to 0 at its neighbours' knots). The weights sum to one at every
 * depth, which is why a master gain and the sliders are collinear (see slider-fit.ts for the split).
 * Knot placement and end behaviour follow common practice, no source (see SliderBank).
 */
import type {SliderBank} from './types.js';

/** Displayed depths of the slider knots, cm, shallow to deep. */
export function knotDepths(bank: SliderBank, displayDepthCm: number): number[] {
	const n = bank.count;
	if (bank.knots === 'band-edges') {
		if (n === 1) return [displayDepthCm / 2];
		return Array.from({length: n}, (_, k) => (k * displayDepthCm) / (n - 1));
	}
	return Array.from({length: n}, (_, k) => ((k + 0.5) * displayDepthCm) / n);
}

/**
 * Weights of every slider at one displayed depth (length = slider count, sum = 1).
 * Outside the first/last knot, `flat` holds the end slider and `extrapolate` continues the end
 * segment (weights may then be negative or above one, but still sum to one).
 */
export function basisWeights(knots: readonly number[], ends: SliderBank['ends'], depthCm: number): number[] {
	const w = new Array<number>(knots.length).fill(0);
	const at: HatWeights = [0, 0, 0, 0];
	const count = hatWeights(knots, ends, depthCm, at);
	w[at[0]] = at[1];
	if (count === 2) w[at[2]] = at[3];
	return w;
}

/** The one or two weights that can be non-zero: [slider, weight, next slider, its weight]. */
export type HatWeights = [number, number, number, number];

/**
 * The weights of {@link basisWeights} that can be non-zero, written into `out` in slider order; returns
 * how many (1 or 2). The fit asks for one row per sample and keeps only these.
 */
export function hatWeights(
	knots: readonly number[],
	ends: SliderBank['ends'],
	depthCm: number,
	out: HatWeights,
): 1 | 2 {
	const n = knots.length;
	// One slider alone: the only one, or an end slider held flat beyond its knot.
	let only = -1;
	let k = 0;
	if (n === 1) only = 0;
	else if (depthCm <= knots[0]!) {
		if (ends === 'flat') only = 0;
	} else if (depthCm >= knots[n - 1]!) {
		if (ends === 'flat') only = n - 1;
		k = n - 2;
	} else {
		while (k < n - 2 && depthCm > knots[k + 1]!) k++;
	}
	if (only >= 0) {
		out[0] = only;
		out[1] = 1;
		return 1;
	}
	const a = knots[k]!;
	const b = knots[k + 1]!;
	const t = (depthCm - a) / (b - a);
	out[0] = k;
	out[1] = 1 - t;
	out[2] = k + 1;
	out[3] = t;
	return 2;
}

/** Gain the scanner applies at one displayed depth: master + interpolated sliders, dB. */
export function appliedGainDb(
	knots: readonly number[],
	ends: SliderBank['ends'],
	sliderDb: readonly number[],
	masterDb: number,
	depthCm: number,
): number {
	const w = basisWeights(knots, ends, depthCm);
	let g = masterDb;
	for (let k = 0; k < w.length; k++) g += w[k]! * sliderDb[k]!;
	return g;
}
