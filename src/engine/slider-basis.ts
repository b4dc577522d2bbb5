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
	const n = knots.length;
	const w = new Array<number>(n).fill(0);
	if (n === 1) {
		w[0] = 1;
		return w;
	}
	const first = knots[0]!;
	const last = knots[n - 1]!;
	let k: number;
	if (depthCm <= first) {
		if (ends === 'flat') {
			w[0] = 1;
			return w;
		}
		k = 0;
	} else if (depthCm >= last) {
		if (ends === 'flat') {
			w[n - 1] = 1;
			return w;
		}
		k = n - 2;
	} else {
		k = 0;
		while (k < n - 2 && depthCm > knots[k + 1]!) k++;
	}
	const a = knots[k]!;
	const b = knots[k + 1]!;
	const t = (depthCm - a) / (b - a);
	w[k] = 1 - t;
	w[k + 1] = t;
	return w;
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
