/**
 * Log compression into a dynamic range: grey = 255·u^γ with u = (level − (top − DR))/DR clipped to
 * 0–1 (γ = 1 is the plain logarithmic map of Dutt & Greenleaf 1996, from memory). Also the mean grey
 * a region of fully developed speckle shows at a given mean intensity level — the grey map a
 * gain-step calibration recovers — found by integrating over the exponential intensity.
 */
import type {DisplayMap} from './scanner-behaviour.js';

/** Grey (0–255, not rounded) of one displayed level in dB. */
export function greyOfDb(map: DisplayMap, levelDb: number): number {
	const u = (levelDb - (map.topDb - map.dynamicRangeDb)) / map.dynamicRangeDb;
	if (u <= 0) return 0;
	if (u >= 1) return 255;
	return 255 * (map.curveExponent === 1 ? u : u ** map.curveExponent);
}

/** Quadrature by quantiles: the unit exponential sampled at the midpoints of 2,000 equal-probability bins. */
const quantileCount = 2000;
const unitExponentialQuantilesDb: Float64Array = (() => {
	const q = new Float64Array(quantileCount);
	for (let i = 0; i < quantileCount; i++) q[i] = 10 * Math.log10(-Math.log(1 - (i + 0.5) / quantileCount));
	return q;
})();

/**
 * Expected grey of speckle whose mean intensity is `meanLevelDb` (echo plus noise powers add: the
 * sum of two independent circular Gaussians is one). Smoothing after compression is linear in grey
 * and so keeps this mean away from the clipped ends.
 */
export function meanGreyOfSpeckle(map: DisplayMap, meanLevelDb: number): number {
	let sum = 0;
	for (let i = 0; i < quantileCount; i++) sum += greyOfDb(map, meanLevelDb + unitExponentialQuantilesDb[i]!);
	return sum / quantileCount;
}
