/**
 * Broadband echo loss: how much of a pulse's energy survives a power-law attenuating path.
 *
 * The pulse-echo amplitude spectrum is a generalized normal window
 * |H(f)| = 10^(−(6/20)·|2(f − f0)/(B·f0)|^p) on f > 0: −6 dB at f0 ± B·f0/2 for every steepness p, and
 * p = 2 is the Gaussian P0(f) ∝ exp(−(f − f0)²/(2σ²)) (the window form of Garcia 2022, Comput Methods
 * Programs Biomed 218:106726, from memory; there −6.02 dB). The power spectrum |H|² is weighted by the
 * scatterer's f^m. The path multiplies it by 10^(−k·E(f)/10), where E(f) = Σ A_j·f^(n_j) is the
 * one-way attenuation (dB) accumulated over the layers crossed and k = 2 for a round trip.
 * Because high frequencies die first the surviving spectrum slides down (spectral downshift), so
 * the loss is smaller than the narrowband 2·α(f0)·z (Kuc 1984, IEEE Trans ASSP 32(1):1–6; closed
 * form for n = 1: L = A·(f0 + fc), fc = f0 − 0.4605·σ²·A).
 *
 * The integral is evaluated with Gauss–Legendre quadrature on a window placed around the
 * integrand's peak. With n ≥ 1, m ≥ 0 and p ≥ 1 the log-integrand is concave (|x|^p is convex for
 * p ≥ 1, so −c·|x|^p is concave; f^n with n ≥ 1 is convex; m·ln f is concave), so the peak is unique,
 * the integrand falls monotonically on each side of it, and the window that ends where it has fallen
 * by e^−36 holds all of the mass. The window edges are found by expanding and then bisecting on the
 * fall itself, so they do not depend on the spectrum's shape, and the panels are split at f0 (where
 * |x|^p has no second derivative for p < 2) and at the shoulders of flat-topped spectra. This stays
 * exact deep in tissue, where the spectrum piles up against 0 MHz and a
 * fixed frequency grid (or a quadrature over all real f) goes wrong.
 */

const ln10 = Math.log(10);
/** Natural-log factor of a one-way dB path: 10^(−E/10) = exp(−κ·E). */
const kappa = ln10 / 10;
/** The window ends where the integrand has fallen by this many nepers of power. */
const windowDropNp = 36;
/** Gauss–Legendre points on each side of the peak; 24 keeps the error far below 0.001 dB
 * against the brute-force reference (see the engine tests and bench). */
const nodesPerPanel = 24;

/** ln of the power spectrum |H|² at x = (f − f0)/half-width: −(6/10)·ln10·|x|^p, so −6 dB (of power
 * and of amplitude alike) at |x| = 1. */
const spectrumNp = 0.6 * ln10;

/** Steepness of today's Gaussian (and the plan default). */
export const gaussianSteepness = 2;

/**
 * The steepness to pick when a data sheet gives only the −6 dB fractional bandwidth B: the p that
 * makes the response vanish at 0 MHz (2^−126 of its peak), p = ln 126 / ln(2/B), as one published
 * simulator does (Garcia 2022, Comput Methods Programs Biomed 218:106726; the rule read from its
 * source, citation from memory). 4.0 / 5.3 / 7.0 for 60 / 80 / 100 %; kept within 1–10.
 */
export function steepnessForBandwidth(bandwidthFraction: number): number {
	if (bandwidthFraction <= 0) return gaussianSteepness;
	const p = Math.log(126) / Math.log(2 / bandwidthFraction);
	return p > 0 && Number.isFinite(p) ? Math.min(10, Math.max(1, p)) : 10;
}

/** σ of the Gaussian POWER spectrum from a −6 dB fractional bandwidth: σ = B·f0 / (2·√(1.2·ln10)). */
export function sigmaFromBandwidth(centerMhz: number, bandwidthFraction: number): number {
	return (bandwidthFraction * centerMhz) / (2 * Math.sqrt(1.2 * ln10));
}

/** ln of the pulse-echo power spectrum (peak 0) at f, for half-width h = B·f0/2 and steepness p. */
export function logSpectrum(f: number, centerMhz: number, halfWidthMhz: number, steepness: number): number {
	const x = Math.abs(f - centerMhz) / halfWidthMhz;
	return -spectrumNp * (steepness === 2 ? x * x : x ** steepness);
}

/** One-way path attenuation E(f) = Σ coefficient·f^exponent (dB), grouped by distinct exponent. */
export interface PathTerms {
	readonly exponents: readonly number[];
	/** One-way dB at 1 MHz accumulated per exponent (α0·thickness summed). */
	readonly coefficients: readonly number[];
}

/** One frequency band that crosses the path: a transmit leg, a receive leg or both. */
export interface Band {
	readonly centerMhz: number;
	/** Half the −6 dB width of the pulse-echo amplitude spectrum (B·f0/2), MHz; 0 = narrowband. */
	readonly halfWidthMhz: number;
	/** Steepness p of the spectrum's skirts (2: Gaussian). */
	readonly steepness: number;
	/** Scatterer weighting f^m applied on this band. */
	readonly weightExponent: number;
	/** How many times the band crosses the path: 2 for a round trip, 1 for one leg. */
	readonly legs: number;
}

export interface BandLoss {
	/** Energy lost on the path, dB (≥ 0). */
	readonly lossDb: number;
	/** Power-weighted mean frequency of what survives, MHz. */
	readonly centroidMhz: number;
}

/** f^n given ln f: integer exponents spared, others as exp(n·ln f), ~3× cheaper than pow() in V8. */
function power(f: number, lnF: number, n: number): number {
	return n === 1 ? f : n === 2 ? f * f : Math.exp(n * lnF);
}

/** One-way path attenuation at frequency f, dB. */
export function pathDb(terms: PathTerms, f: number): number {
	return pathDbAt(terms, f, Math.log(f));
}

function pathDbAt(terms: PathTerms, f: number, lnF: number): number {
	let e = 0;
	for (let j = 0; j < terms.exponents.length; j++) {
		const c = terms.coefficients[j]!;
		if (c !== 0) e += c * power(f, lnF, terms.exponents[j]!);
	}
	return e;
}

// Gauss–Legendre nodes and weights on [−1, 1] (Golub–Welsch, computed once at load).
const glNodes: number[] = [];
const glWeights: number[] = [];
(function buildGaussLegendre(n: number) {
	for (let i = 0; i < n; i++) {
		let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
		let dp = 0;
		for (let it = 0; it < 100; it++) {
			let p0 = 1;
			let p1 = x;
			for (let k = 2; k <= n; k++) {
				const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
				p0 = p1;
				p1 = p2;
			}
			dp = (n * (x * p1 - p0)) / (x * x - 1);
			const dx = p1 / dp;
			x -= dx;
			if (Math.abs(dx) < 1e-15) break;
		}
		glNodes.push(x);
		glWeights.push(2 / ((1 - x * x) * dp * dp));
	}
})(nodesPerPanel);

/** Slope and curvature of the log-integrand at the last f asked for (BandIntegrand.derivativesAt; never re-entered). */
const derivatives = {slope: 0, curvature: 0};

/** A band with the path already fixed: evaluates the log-integrand and its derivatives. */
class BandIntegrand {
	private readonly f0: number;
	private readonly h: number;
	private readonly p: number;
	private readonly m: number;
	/** The scatterer weighting's exponent m (of f^m). */
	get weightExponent(): number {
		return this.m;
	}
	private readonly k: number;

	constructor(
		band: Band,
		private readonly terms: PathTerms,
	) {
		this.f0 = band.centerMhz;
		this.h = band.halfWidthMhz;
		this.p = band.steepness;
		this.m = band.weightExponent;
		this.k = kappa * band.legs;
	}

	/** ln of the integrand at f > 0. */
	log(f: number): number {
		const x = Math.abs(f - this.f0) / this.h;
		const lnF = Math.log(f);
		const shape = this.p === 2 ? x * x : x ** this.p;
		return -spectrumNp * shape + (this.m === 0 ? 0 : this.m * lnF) - this.k * pathDbAt(this.terms, f, lnF);
	}

	slope(f: number): number {
		this.derivativesAt(f);
		return derivatives.slope;
	}

	/** Second derivative; −∞ at f0 when p < 2 (the kink of |x|^p). */
	curvature(f: number): number {
		this.derivativesAt(f);
		return derivatives.curvature;
	}

	/**
	 * Slope and curvature of the log-integrand at f, into `derivatives`: the Newton steps need both.
	 * Each path exponent's f^(n−2) is worked out once, as exp((n−2)·ln f), with f^(n−1) = f·f^(n−2)
	 * (two pow() calls per exponent were a sixth of an integral's time); where that overflows (at or
	 * next to 0 MHz) the powers are taken apart.
	 */
	private derivativesAt(f: number): void {
		const d = f - this.f0;
		const h = this.h;
		const p = this.p;
		let shapeSlope: number;
		let shapeCurvature: number;
		if (p === 2) {
			shapeSlope = (2 * d) / (h * h);
			shapeCurvature = 2 / (h * h);
		} else {
			const x = Math.abs(d) / h;
			shapeSlope = (Math.sign(d) * p * x ** (p - 1)) / h;
			shapeCurvature = (p === 1 ? 0 : p * (p - 1) * x ** (p - 2)) / (h * h);
		}
		const {exponents, coefficients} = this.terms;
		let pathSlopeDb = 0;
		let pathCurvatureDb = 0;
		const lnF = Math.log(f);
		for (let j = 0; j < exponents.length; j++) {
			const n = exponents[j]!;
			const c = coefficients[j]!;
			if (c === 0) continue;
			if (n === 1) pathSlopeDb += c;
			else if (n === 2) {
				pathSlopeDb += 2 * c * f;
				pathCurvatureDb += 2 * c;
			} else {
				const fn2 = Math.exp((n - 2) * lnF);
				if (Number.isFinite(fn2)) {
					pathSlopeDb += c * n * fn2 * f;
					pathCurvatureDb += c * n * (n - 1) * fn2;
				} else {
					pathSlopeDb += c * n * f ** (n - 1);
					pathCurvatureDb += c * n * (n - 1) * f ** (n - 2);
				}
			}
		}
		const m = this.m;
		derivatives.slope = -spectrumNp * shapeSlope + (m === 0 ? 0 : m / f) - this.k * pathSlopeDb;
		derivatives.curvature = -spectrumNp * shapeCurvature - (m === 0 ? 0 : m / (f * f)) - this.k * pathCurvatureDb;
	}

	/** Peak of the (log-concave) integrand on f ≥ 0: bracketed Newton on the slope, bisection where
	 * Newton cannot step (a kink at f0 or a flat top). */
	peak(start?: number): number {
		const {f0, h, m} = this;
		if (m === 0 && this.slope(0) <= 0) return 0;
		let lo = 0;
		let hi = f0 + 12 * h + 2 * m * h + 1;
		let f = Math.min(Math.max(start ?? f0, 1e-6), hi);
		for (let it = 0; it < 200; it++) {
			this.derivativesAt(f);
			const g = derivatives.slope;
			if (g === 0) return f;
			if (g > 0) lo = f;
			else hi = f;
			const c = derivatives.curvature;
			let next = Number.isFinite(c) && c < 0 ? f - g / c : Number.NaN;
			// A step landing exactly on the bracket's edge is a good one (it happens when the peak sits
			// at or next to the edge): refusing it for a halving took 10–40 steps instead of 2–3.
			if (!(next >= lo && next <= hi)) next = (lo + hi) / 2;
			if (Math.abs(next - f) <= 1e-12 * Math.max(1, f) || hi - lo <= 1e-13 * Math.max(1, f)) return next;
			f = next;
		}
		return f;
	}
}

/** A smooth, slowly varying log-factor multiplying the integrand (the tissue harmonic's build-up),
 * bounded above by `maxNp` over the band relative to its value at the envelope's peak. */
export type LogFactor = (f: number) => number;

/** Running sums ∫ exp(…) df and ∫ f·exp(…) df of one integral. */
interface Moments {
	m0: number;
	m1: number;
}

/** Adds ∫ exp(g(f) + x(f) − gPeak) df and ∫ f·exp(…) df over [a, b] by Gauss–Legendre to `sums`. */
function panel(ig: BandIntegrand, a: number, b: number, gPeak: number, sums: Moments, extra?: LogFactor): void {
	const half = (b - a) / 2;
	const mid = (a + b) / 2;
	let s0 = 0;
	let s1 = 0;
	for (let i = 0; i < glNodes.length; i++) {
		const f = mid + half * glNodes[i]!;
		const v = glWeights[i]! * Math.exp(ig.log(f) + (extra ? extra(f) : 0) - gPeak);
		s0 += v;
		s1 += v * f;
	}
	sums.m0 += s0 * half;
	sums.m1 += s1 * half;
}

/**
 * Where, going from the peak in one direction, the log-integrand has fallen by about `dropNp`
 * (anywhere within `toleranceNp` of it will do). Log-concavity makes the fall monotone on each side,
 * so the point is bracketed as it is searched. The first try is where the peak's own curvature (width
 * `width`) puts it; then, while unbracketed, the distance grows as the fall were quadratic in it, and
 * once bracketed the square root of the fall (straight in the distance for a Gaussian) is
 * interpolated between the ends. Near 0 MHz a scatterer weighting f^m sends the fall to infinity as
 * m·ln(1/f): there the step is taken in ln f. A Gaussian lands at once, most others in 2–3 tries;
 * doubling out and halving back took ~10, and ~30 against an f^m weighting. Returns 0 on the left when
 * the fall never gets that far above 0 MHz.
 */
function fallPoint(
	ig: BandIntegrand,
	fp: number,
	gPeak: number,
	dir: 1 | -1,
	width: number,
	dropNp: number,
	toleranceNp: number,
): number {
	const rootDrop = Math.sqrt(dropNp);
	const m = ig.weightExponent;
	// Frequencies: the fall is below dropNp at `near`, above it at `far` (NaN until known).
	let near = fp;
	let gNear = 0;
	let far = Number.NaN;
	let gFar = Number.POSITIVE_INFINITY;
	// Which end the last try replaced; a run on one side halves the other end's weight (Illinois).
	let last = 0;
	let nearScale = 1;
	let farScale = 1;
	let f = fp + dir * width * Math.sqrt(2 * dropNp);
	for (let it = 0; it < 100; it++) {
		if (dir < 0 && f <= 0) {
			// At or past 0 MHz: the window may reach it.
			if (!(far === 0)) {
				far = 0;
				gFar = gPeak - ig.log(Number.MIN_VALUE);
				farScale = 1;
				if (gFar < dropNp) return 0;
			}
		} else {
			const g = gPeak - ig.log(f > 0 ? f : Number.MIN_VALUE);
			if (Math.abs(g - dropNp) <= toleranceNp) return f;
			if (g > dropNp) {
				far = f;
				gFar = g;
				farScale = 1;
				if (last > 0) nearScale /= 2;
				last = 1;
			} else {
				near = f;
				gNear = g;
				nearScale = 1;
				if (last < 0) farScale /= 2;
				last = -1;
			}
			if (Number.isNaN(far) && dir * (f - fp) > 1e6) return f;
		}
		const gN = dropNp - (dropNp - gNear) * nearScale;
		const gF = dropNp + (gFar - dropNp) * farScale;
		let next: number;
		if (Number.isNaN(far)) {
			const grow = gNear > 0 ? Math.min(4, Math.max(1.25, rootDrop / Math.sqrt(gNear))) : 2;
			next = fp + (near - fp) * grow;
			if (next === near) next = fp + dir * width;
		} else if (dir < 0 && m > 0) {
			// Towards 0 MHz under an f^m weighting the fall grows as m·ln(1/f): interpolate in ln f, or
			// from 0 itself (where the fall is as good as infinite) step by the weighting alone.
			next =
				far > 0
					? near * Math.exp(((dropNp - gN) * Math.log(far / near)) / (gF - gN))
					: near * Math.exp(-(dropNp - gN) / m);
		} else {
			// The square root of the fall is straight in the distance for a Gaussian.
			const rN = Math.sqrt(Math.max(gN, 0));
			next = near + ((rootDrop - rN) * (far - near)) / (Math.sqrt(gF) - rN);
		}
		const inside = Number.isNaN(far) || (dir > 0 ? next > near && next < far : next < near && next > far);
		if (!inside || !Number.isFinite(next)) next = Number.isNaN(far) ? fp + 2 * (near - fp) : (near + far) / 2;
		if (next === near || next === far) return Number.isNaN(far) ? next : far;
		f = next;
	}
	return Number.isNaN(far) ? f : far;
}

/** Panel edges from the peak out to one window edge, in order from the peak: the shoulder where the
 * integrand has fallen by 1 Np and the spectrum's centre `kink` (f0 for p < 2, where |x|^p has a
 * corner), each only when it lies strictly between. Written into `out`; returns how many. */
function panelEdges(fp: number, edge: number, shoulder: number, kink: number, out: Float64Array): number {
	const dir = edge > fp ? 1 : -1;
	const inside = (v: number) => dir * (v - fp) > 0 && dir * (edge - v) > 0;
	let n = 0;
	out[n++] = fp;
	const s = inside(shoulder);
	const k = inside(kink) && kink !== shoulder;
	if (s && k) {
		const nearFirst = dir * (shoulder - kink) < 0;
		out[n++] = nearFirst ? shoulder : kink;
		out[n++] = nearFirst ? kink : shoulder;
	} else if (s) out[n++] = shoulder;
	else if (k) out[n++] = kink;
	if (edge !== fp) out[n++] = edge;
	return n;
}

/**
 * The panel edges and the moments of the integral being worked out, kept between calls: logIntegral
 * is never re-entered (its integrand and build-up factor are plain arithmetic), and these small
 * arrays and objects were a third of what a curve allocated.
 */
const edges = new Float64Array(4);
const sums: Moments = {m0: 0, m1: 0};

/** The window reaches this much further when a build-up factor multiplies the integrand. */
const extraWindowNp = 12;

/**
 * ln ∫ integrand df and the centroid, integrating around the peak. With `extra`, the window and the
 * panels come from the (log-concave) envelope, widened, and the factor is applied on the nodes.
 */
function logIntegral(
	ig: BandIntegrand,
	halfWidth: number,
	f0: number,
	steepness: number,
	peakGuess?: number,
	extra?: LogFactor,
): {logMass: number; centroid: number; peak: number} {
	const fp = ig.peak(peakGuess);
	const gEnvelope = ig.log(fp > 0 ? fp : Number.MIN_VALUE);
	// Scale by the factor at the peak so the exponentials stay near 1.
	const gPeak = gEnvelope + (extra ? extra(fp > 0 ? fp : Number.MIN_VALUE) : 0);
	const c = ig.curvature(fp > 0 ? fp : 1e-9);
	// Width scale of the peak: the curvature where it is meaningful, never wider than the spectrum.
	let w = Number.isFinite(c) && c < 0 ? Math.min(halfWidth, 1 / Math.sqrt(-c)) : halfWidth;
	if (fp === 0) w = Math.min(halfWidth, 1 / Math.max(1e-12, -ig.slope(Number.MIN_VALUE)));
	sums.m0 = 0;
	sums.m1 = 0;
	for (let side = 0; side < 2; side++) {
		const dir = side === 0 ? 1 : -1;
		if (dir < 0 && fp === 0) continue;
		const edge = fallPoint(ig, fp, gEnvelope, dir, w, windowDropNp + (extra ? extraWindowNp : 0), 4);
		if (edge === fp) continue;
		// A Gaussian needs no shoulder panel (one panel per side is exact to < 0.001 dB).
		const shoulder = steepness > 2 || extra ? fallPoint(ig, fp, gEnvelope, dir, w, 1, 0.6) : edge;
		const count = panelEdges(fp, edge, shoulder, steepness < 2 ? f0 : fp, edges);
		for (let i = 1; i < count; i++) {
			const a = Math.min(edges[i - 1]!, edges[i]!);
			const b = Math.max(edges[i - 1]!, edges[i]!);
			if (b <= a) continue;
			panel(ig, a, b, gPeak, sums, extra);
		}
	}
	return {logMass: gPeak + Math.log(sums.m0), centroid: sums.m1 / sums.m0, peak: fp};
}

const emptyPath: PathTerms = {exponents: [], coefficients: []};

/** ln ∫ band integrand × e^extra df over f > 0 and its centroid (the tissue harmonic's integral). */
export function bandLogMass(
	band: Band,
	terms: PathTerms,
	extra?: LogFactor,
	peakGuess?: number,
): {logMass: number; centroidMhz: number; peak: number} {
	const r = logIntegral(
		new BandIntegrand(band, terms),
		band.halfWidthMhz,
		band.centerMhz,
		band.steepness,
		peakGuess,
		extra,
	);
	return {logMass: r.logMass, centroidMhz: r.centroid, peak: r.peak};
}

/** No-path integrals already worked out, by band: every corner model of a band, and every rung of a
 * frequency ladder that comes back to a frequency, share one. Pure (same band, same number); cleared
 * when it grows past a bound so a long session cannot fill memory with them. */
const references = new Map<string, {logMass: number}>();
const referencesKept = 512;

function referenceOf(band: Band): {logMass: number} {
	const key = `${band.centerMhz}|${band.halfWidthMhz}|${band.steepness}|${band.weightExponent}|${band.legs}`;
	let r = references.get(key);
	if (!r) {
		r = logIntegral(new BandIntegrand(band, emptyPath), band.halfWidthMhz, band.centerMhz, band.steepness);
		if (references.size >= referencesKept) references.clear();
		references.set(key, {logMass: r.logMass});
	}
	return r;
}

/**
 * Caches the no-path normalisation of each band, so each depth costs one integral per band.
 */
export class BandLossCalculator {
	private readonly reference: {logMass: number} | undefined;
	/** Peak of the last integrand: neighbouring depths have nearby peaks, so Newton starts there. */
	private lastPeak: number | undefined;

	/** Integrates over a spectrum (false for a narrowband probe, whose loss is closed form). */
	get broadband(): boolean {
		return this.reference !== undefined;
	}

	constructor(readonly band: Band) {
		this.reference = band.halfWidthMhz > 0 ? referenceOf(band) : undefined;
	}

	/** Loss and surviving centroid after `terms` (one-way dB coefficients) is crossed `legs` times. */
	loss(terms: PathTerms): BandLoss {
		const {band} = this;
		if (!this.reference) {
			return {lossDb: band.legs * pathDb(terms, band.centerMhz), centroidMhz: band.centerMhz};
		}
		const r = logIntegral(
			new BandIntegrand(band, terms),
			band.halfWidthMhz,
			band.centerMhz,
			band.steepness,
			this.lastPeak,
		);
		this.lastPeak = r.peak > 0 ? r.peak : undefined;
		return {lossDb: (-10 / ln10) * (r.logMass - this.reference.logMass), centroidMhz: r.centroid};
	}
}

/** The bands of a probe: a round trip at f0, or (harmonic receive) out at f0 and back at 2·f0. */
export function probeBands(
	centerMhz: number,
	bandwidthFraction: number,
	scattererExponent: number,
	harmonic: boolean,
	steepness = gaussianSteepness,
): Band[] {
	const halfWidthMhz = (bandwidthFraction * centerMhz) / 2;
	if (!harmonic) return [{centerMhz, halfWidthMhz, steepness, weightExponent: scattererExponent, legs: 2}];
	// Simplification (stated in outputs): the harmonic is taken as present from the skin, the outward
	// leg sees the transmit band and the return leg a band at 2·f0 with the same fractional width.
	return [
		{centerMhz, halfWidthMhz, steepness, weightExponent: 0, legs: 1},
		{centerMhz: 2 * centerMhz, halfWidthMhz: 2 * halfWidthMhz, steepness, weightExponent: scattererExponent, legs: 1},
	];
}
