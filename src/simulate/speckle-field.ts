/**
 * Fully developed, spatially correlated speckle: a complex Gaussian field blurred to the size of one
 * resolution cell, so its envelope is Rayleigh and its intensity exponential (Burckhardt 1978;
 * Wagner et al. 1983, from memory) with the grain of the probe. Two independent fields are made, one
 * for the tissue echo and one for thermal noise; both are kept so that a change of gain only re-maps
 * grey levels and never re-draws the speckle.
 */
import {fillComplexGaussian, mulberry32} from './seeded-random.js';

/** Speed the display assumes when it turns the pulse length into depth, cm/µs. */
const soundCmPerUs = 0.154;
/** Narrowest fractional bandwidth used for the cell size, so a 0 (narrowband) plan still draws. */
const minimumBandwidth = 0.3;
/** Beam width as a multiple of the pulse length: a focused beam at f-number ~2 is about λ·F# wide,
 * 2–4 axial cells at common bandwidths (from memory). */
const lateralCellsPerAxial = 3;

export interface SpeckleCell {
	/** −6 dB axial size, cm: half the spatial pulse length, c / (2·B·f0). */
	readonly axialCm: number;
	/** Lateral size, cm. */
	readonly lateralCm: number;
}

/** The speckle grain of a probe: axial from its bandwidth, lateral a few axial cells. */
export function speckleCellOf(probe: {readonly centerMhz: number; readonly bandwidthFraction: number}): SpeckleCell {
	const bandwidth = Math.max(minimumBandwidth, probe.bandwidthFraction);
	const axialCm = soundCmPerUs / (2 * bandwidth * probe.centerMhz);
	return {axialCm, lateralCm: lateralCellsPerAxial * axialCm};
}

/** One complex field, row-major (row = depth). */
export interface ComplexField {
	readonly re: Float32Array;
	readonly im: Float32Array;
}

export interface SpeckleFields {
	readonly width: number;
	readonly height: number;
	/** Tissue echo, unit mean intensity. */
	readonly echo: ComplexField;
	/** Thermal noise after the receive filter, unit mean intensity, independent of the echo. */
	readonly noise: ComplexField;
}

export interface SpeckleRequest {
	readonly width: number;
	readonly height: number;
	/** Cell sizes in pixels (FWHM of the blur), axial along rows, lateral along columns. */
	readonly axialCellPx: number;
	readonly lateralCellPx: number;
	readonly seed: number;
}

/**
 * Gaussian taps for a FWHM in pixels, scaled so the sum of squares is 1: a blurred unit-variance
 * white field keeps unit variance, hence unit mean intensity without measuring it.
 */
export function blurTaps(fwhmPx: number): Float32Array {
	const sigma = fwhmPx / 2.3548;
	if (sigma < 0.3) return Float32Array.of(1);
	const radius = Math.ceil(3 * sigma);
	const taps = new Float32Array(2 * radius + 1);
	let energy = 0;
	for (let k = -radius; k <= radius; k++) {
		const w = Math.exp(-(k * k) / (2 * sigma * sigma));
		taps[k + radius] = w;
		energy += w * w;
	}
	const scale = 1 / Math.sqrt(energy);
	for (let k = 0; k < taps.length; k++) taps[k]! *= scale;
	return taps;
}

/** White complex field on a padded grid, blurred separably; the padding keeps the edges as grainy
 * as the middle. */
function blurredField(
	next: () => number,
	req: SpeckleRequest,
	rowTaps: Float32Array,
	colTaps: Float32Array,
): ComplexField {
	const ra = (rowTaps.length - 1) / 2;
	const rl = (colTaps.length - 1) / 2;
	const pw = req.width + 2 * rl;
	const ph = req.height + 2 * ra;
	const wre = new Float32Array(pw * ph);
	const wim = new Float32Array(pw * ph);
	// The standard normal pair has variance 1 per component; halve it so |z|² has mean 1.
	fillComplexGaussian(next, wre, wim);
	const half = Math.SQRT1_2;
	for (let i = 0; i < wre.length; i++) {
		wre[i]! *= half;
		wim[i]! *= half;
	}
	// Lateral pass (along each padded row), keeping all padded rows.
	const lre = new Float32Array(req.width * ph);
	const lim = new Float32Array(req.width * ph);
	for (let y = 0; y < ph; y++) {
		const src = y * pw;
		const dst = y * req.width;
		for (let x = 0; x < req.width; x++) {
			let sr = 0;
			let si = 0;
			for (let k = 0; k < colTaps.length; k++) {
				const w = colTaps[k]!;
				sr += w * wre[src + x + k]!;
				si += w * wim[src + x + k]!;
			}
			lre[dst + x] = sr;
			lim[dst + x] = si;
		}
	}
	// Axial pass (down each column).
	const re = new Float32Array(req.width * req.height);
	const im = new Float32Array(req.width * req.height);
	for (let y = 0; y < req.height; y++) {
		for (let k = 0; k < rowTaps.length; k++) {
			const w = rowTaps[k]!;
			const src = (y + k) * req.width;
			const dst = y * req.width;
			for (let x = 0; x < req.width; x++) {
				re[dst + x]! += w * lre[src + x]!;
				im[dst + x]! += w * lim[src + x]!;
			}
		}
	}
	return {re, im};
}

/** The echo and noise fields for one picture geometry. Same request, same numbers. */
export function makeSpeckle(req: SpeckleRequest): SpeckleFields {
	const next = mulberry32(req.seed);
	const rowTaps = blurTaps(req.axialCellPx);
	const colTaps = blurTaps(req.lateralCellPx);
	const echo = blurredField(next, req, rowTaps, colTaps);
	const noise = blurredField(next, req, rowTaps, colTaps);
	return {width: req.width, height: req.height, echo, noise};
}
