/**
 * Joint self-calibration of the grey map from gain steps: the mean grey of band b in image k is
 * m_bk = g(E_b + G_k), g unknown and monotone, E_b the band's level at 0 dB master gain. With
 * h = g⁻¹ piecewise linear on grey knots, h(m_bk) − E_b = G_k is linear in the unknowns (the
 * video-signal analysis of Knipp et al. 1997 solved jointly, as camera response curves are recovered
 * from exposure series: Debevec & Malik 1997, from memory). Least squares with a second-difference
 * smoothness term on h; h and E share an additive constant, fixed here by mean E_b = 0.
 */
import {backSolveTransposed, cholesky, forwardSolve} from '../engine/dense-linear-algebra.js';
import {CalibrationRefusal} from './calibration-refusal.js';

export interface StepObservation {
	readonly image: number;
	readonly band: number;
	readonly meanGrey: number;
	/** SD of the band mean, grey levels. */
	readonly sdMeanGrey: number;
}

export interface GreyMapFit {
	/** Grey knots (ascending) and h at them: the level (dB, on the master-gain scale) shown at that grey. */
	readonly knots: readonly number[];
	readonly levelDb: readonly number[];
	/** Band levels at 0 dB master gain, by band index (NaN where the band had no usable mean). */
	readonly bandLevelDb: ReadonlyMap<number, number>;
	/** SD of each band level, dB. */
	readonly bandSdDb: ReadonlyMap<number, number>;
	/** RMS of h(m_bk) − E_b − G_k over the observations, dB. */
	readonly rmsResidualDb: number;
}

/** Grey spacing of the map's knots. */
const knotSpacingGrey = 8;
/** A knot of h may fall below its lower neighbour by at most this before the map counts as not monotone, dB. */
export const monotoneToleranceDb = 0.5;
/** Bands two steps must share to be stitched together. */
export const minSharedBands = 3;
/** Largest run of greys no band mean fell in before the map there counts as guessed, grey levels. */
export const maxGreyGap = 24;

/** Piecewise-linear interpolation weights of x on ascending knots (clamped to the ends). */
function weightsOn(knots: readonly number[], x: number): [number, number, number] {
	const n = knots.length;
	if (x <= knots[0]!) return [0, 1, 0];
	if (x >= knots[n - 1]!) return [n - 2, 0, 1];
	let j = 0;
	while (j < n - 2 && x > knots[j + 1]!) j++;
	const t = (x - knots[j]!) / (knots[j + 1]! - knots[j]!);
	return [j, 1 - t, t];
}

export function evaluateMap(knots: readonly number[], values: readonly number[], grey: number): number {
	const [j, a, b] = weightsOn(knots, grey);
	return a * values[j]! + b * values[j + 1]!;
}

/** Grey shown at a level: the inverse of the (monotone) fitted h, by interpolation. */
export function greyAtLevel(knots: readonly number[], values: readonly number[], levelDb: number): number {
	const n = knots.length;
	if (levelDb <= values[0]!) return knots[0]!;
	if (levelDb >= values[n - 1]!) return knots[n - 1]!;
	for (let j = 0; j < n - 1; j++) {
		const lo = values[j]!;
		const hi = values[j + 1]!;
		if (levelDb >= lo && levelDb <= hi && hi > lo)
			return knots[j]! + ((levelDb - lo) / (hi - lo)) * (knots[j + 1]! - knots[j]!);
	}
	return knots[n - 1]!;
}

/** Images linked by at least minSharedBands common bands must form one connected set. */
function checkStitching(observations: readonly StepObservation[], gainsDb: readonly number[]): void {
	const k = gainsDb.length;
	const bandsOf = Array.from({length: k}, () => new Set<number>());
	for (const o of observations) bandsOf[o.image]!.add(o.band);
	const parent = Array.from({length: k}, (_, i) => i);
	const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i]!)));
	for (let a = 0; a < k; a++) {
		for (let b = a + 1; b < k; b++) {
			let shared = 0;
			for (const band of bandsOf[a]!) if (bandsOf[b]!.has(band)) shared++;
			if (shared >= minSharedBands) parent[find(a)] = find(b);
		}
	}
	const groups = new Set(Array.from({length: k}, (_, i) => find(i)));
	if (groups.size > 1) {
		const lonely = Array.from({length: k}, (_, i) => i).filter((i) => find(i) !== find(0));
		throw new CalibrationRefusal(
			'gainSteps',
			`the steps overlap too little to stitch one grey map: step${lonely.length > 1 ? 's' : ''} ` +
				`${lonely.map((i) => `${i + 1} (${gainsDb[i]} dB)`).join(', ')} share${lonely.length > 1 ? '' : 's'} ` +
				`fewer than ${minSharedBands} usable depth bands with the others; use gain steps about ` +
				'3–6 dB apart',
		);
	}
}

export function fitGreyMap(observations: readonly StepObservation[], gainsDb: readonly number[]): GreyMapFit {
	checkStitching(observations, gainsDb);
	const greys = observations.map((o) => o.meanGrey);
	const sorted = [...greys].sort((a, b) => a - b);
	for (let i = 1; i < sorted.length; i++) {
		if (sorted[i]! - sorted[i - 1]! > maxGreyGap) {
			throw new CalibrationRefusal(
				'gainSteps',
				'the steps overlap too little to stitch one grey map: ' +
					`no depth band showed a grey between ${sorted[i - 1]!.toFixed(0)} and ${sorted[i]!.toFixed(0)}; ` +
					'add gain steps in between (about 3–6 dB apart)',
			);
		}
	}
	const lo = Math.min(...greys);
	const hi = Math.max(...greys);
	const nKnots = Math.max(2, Math.ceil((hi - lo) / knotSpacingGrey) + 1);
	const knots = Array.from({length: nKnots}, (_, j) => lo + ((hi - lo) * j) / (nKnots - 1));
	const bands = [...new Set(observations.map((o) => o.band))].sort((a, b) => a - b);
	const bandIndex = new Map(bands.map((b, i) => [b, i]));
	const nb = bands.length;
	const n = nKnots + nb;
	const ata = new Float64Array(n * n);
	const atb = new Float64Array(n);
	const add = (idx: number[], val: number[], rhs: number, w: number) => {
		for (let p = 0; p < idx.length; p++) {
			atb[idx[p]!]! += w * val[p]! * rhs;
			for (let q = 0; q < idx.length; q++) ata[idx[p]! * n + idx[q]!]! += w * val[p]! * val[q]!;
		}
	};
	// Weights from the level noise: a band mean's grey SD, over a nominal slope of 0.25 dB per grey.
	const obsWeight = (o: StepObservation) => 1 / Math.max(0.01, (0.25 * o.sdMeanGrey) ** 2);
	for (const o of observations) {
		const [j, a, b] = weightsOn(knots, o.meanGrey);
		add([j, j + 1, nKnots + bandIndex.get(o.band)!], [a, b, -1], gainsDb[o.image]!, obsWeight(o));
	}
	// Smoothness: second differences of h of about 0.3 dB per knot are expected.
	const smooth = 1 / 0.3 ** 2;
	for (let j = 1; j < nKnots - 1; j++) add([j - 1, j, j + 1], [1, -2, 1], 0, smooth);
	// Anchor: mean band level 0.
	add(
		Array.from({length: nb}, (_, i) => nKnots + i),
		new Array<number>(nb).fill(1 / nb),
		0,
		1e4,
	);
	const l = Float64Array.from(ata);
	if (!cholesky(l, n))
		throw new CalibrationRefusal(
			'gainSteps',
			'the gain steps do not determine a grey map (too few distinct greys or bands)',
		);
	const x = Float64Array.from(atb);
	forwardSolve(l, n, x);
	backSolveTransposed(l, n, x);
	const levelDb = Array.from(x.subarray(0, nKnots));
	for (let j = 1; j < nKnots; j++) {
		if (levelDb[j]! < levelDb[j - 1]! - monotoneToleranceDb) {
			throw new CalibrationRefusal(
				'gainSteps',
				'the grey map is not monotone: more gain showed darker grey near grey ' +
					`${knots[j]!.toFixed(0)} (by ${(levelDb[j - 1]! - levelDb[j]!).toFixed(1)} dB, tolerance ` +
					`${monotoneToleranceDb} dB); check that only the master gain changed between the images ` +
					'and that adaptive image optimisation is off',
			);
		}
	}
	// Tiny dips within tolerance are levelled so the map can be inverted.
	for (let j = 1; j < nKnots; j++) levelDb[j] = Math.max(levelDb[j]!, levelDb[j - 1]! + 1e-6);
	// Per-band level SD: each observation gives E_b = h(m) − G with SD slope·sdMeanGrey.
	const bandLevelDb = new Map<number, number>();
	const bandSdDb = new Map<number, number>();
	let sq = 0;
	for (const band of bands) bandLevelDb.set(band, x[nKnots + bandIndex.get(band)!]!);
	const inverseVariance = new Map<number, number>();
	for (const o of observations) {
		const [j] = weightsOn(knots, o.meanGrey);
		const slope = (levelDb[j + 1]! - levelDb[j]!) / (knots[j + 1]! - knots[j]!);
		const sd = Math.max(1e-3, slope * o.sdMeanGrey);
		inverseVariance.set(o.band, (inverseVariance.get(o.band) ?? 0) + 1 / sd ** 2);
		const r = evaluateMap(knots, levelDb, o.meanGrey) - bandLevelDb.get(o.band)! - gainsDb[o.image]!;
		sq += r * r;
	}
	for (const [band, iv] of inverseVariance) bandSdDb.set(band, 1 / Math.sqrt(iv));
	return {knots, levelDb, bandLevelDb, bandSdDb, rmsResidualDb: Math.sqrt(sq / observations.length)};
}
