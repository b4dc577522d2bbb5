/**
 * Tissue harmonic receive: the second harmonic that the tissue builds up on the way down.
 *
 * Quasi-linear plane-wave build-up (Cobb 1983, J Acoust Soc Am 73:1525; formula verified through a
 * textbook excerpt, citation from memory): the harmonic p2 at 2f grows from a source proportional to
 * β·ω·p1²/(2ρc³), where p1 is the fundamental at f, and is attenuated at 2f as it goes:
 *   dp2/dz = β·ω·p1²/(2ρc³) − α(2f)·p2,   β = 1 + B/(2A).
 * In one uniform medium this gives p2 ∝ (e^(−2α1·z) − e^(−α2·z))/(α2 − 2α1); through layers the
 * source term is integrated layer by layer in closed form. The echo of a scatterer at z returns at
 * 2f, so its amplitude is ∝ e^(−a2(z))·p2(z): the downward leg costs about 2·α(f0)·z (the source
 * goes with p1²), the return leg α(2f0)·z, and the build-up from zero makes the near field dark.
 *
 * Over the spectrum: the fundamental component at f makes the harmonic at F = 2f; the harmonic echo's
 * spectrum without attenuation is taken as the probe's shape centred at 2·f0 with the same
 * fractional width (a simplification, stated in outputs), weighted by the scatterer's F^m. Levels
 * are relative to the echo from 1 cm true depth, where the harmonic has built up, because at the
 * skin there is none to be relative to.
 *
 * Plane waves only: in real beams focusing shapes the harmonic's depth profile (Ward, Baker &
 * Humphrey 1997; Duck 2002; from memory), and the skin pressure, which sets the absolute level, is
 * not known to the planner. The model's depth shape is what the plan uses.
 */
import {bandLogMass, type Band, type PathTerms} from './echo-spectrum.js';
import {betaOf} from './nonlinearity.js';
import type {Tissue} from './types.js';

const ln10 = Math.log(10);
/** Np of amplitude per one-way dB. */
const npPerDb = ln10 / 20;

/** True depth the tissue-harmonic levels are relative to, cm (the shared reference's worked
 * example C47 is "re 1 cm"). */
export const harmonicReferenceCm = 1;
/** Shallowest true depth evaluated, cm: the build-up is zero at the skin, and within the first
 * millimetre (about a pulse length) the plane-wave quasi-linear picture means little. */
export const harmonicNearFieldFloorCm = 0.1;

/** One layer (or the part of it) the beam has crossed on the way to the depth. */
export interface BuildUpSegment {
	/** Source strength β/(ρc³), relative to a soft-tissue reference. */
	readonly strength: number;
	readonly lengthCm: number;
	/** One-way α0 and n of the layer. */
	readonly alphaDbPerCmMhz: number;
	readonly exponent: number;
	/** One-way path coefficients (per exponent, as in PathTerms) at the bottom of the segment. */
	readonly bottom: readonly number[];
}

export interface BuildUpPath {
	/** One-way path to the depth. */
	readonly terms: PathTerms;
	readonly segments: readonly BuildUpSegment[];
}

/** β/(ρc³) of a tissue relative to β = 4.5, ρ = 1060 kg/m³, c = 1540 m/s (only ratios matter). */
export function buildUpStrength(t: Tissue): number {
	const reference = 4.5 / (1060 * 1540 ** 3);
	return betaOf(t) / (t.densityKgM3 * t.speedMps ** 3) / reference;
}

/** (2·a(f) − a(2f)) in Np for one-way path coefficients: ≤ 0 for n ≥ 1, zero for n = 1. */
function twoLegExcessNp(exponents: readonly number[], coefficients: readonly number[], f: number): number {
	let u = 0;
	for (let j = 0; j < exponents.length; j++) {
		const c = coefficients[j]!;
		if (c === 0) continue;
		const n = exponents[j]!;
		if (n === 1) continue;
		u += c * f ** n * (2 - 2 ** n);
	}
	return u * npPerDb;
}

/**
 * ln of the build-up integral D(f, z) = ∫0^z s(z')·e^(u(z) − u(z')) dz' with u = 2·a(f) − a(2f),
 * layer by layer in closed form. The harmonic echo's power is the envelope e^(−κ·(2E(f) + E(2f)))
 * times D².
 */
export function logBuildUp(path: BuildUpPath, f: number): number {
	const {exponents, coefficients} = path.terms;
	const uz = twoLegExcessNp(exponents, coefficients, f);
	let d = 0;
	for (const s of path.segments) {
		if (s.lengthCm <= 0) continue;
		const uBottom = twoLegExcessNp(exponents, s.bottom, f);
		// u falls along the segment at rate w ≥ 0 (Np/cm).
		const w = s.alphaDbPerCmMhz * f ** s.exponent * (2 ** s.exponent - 2) * npPerDb;
		const wd = w * s.lengthCm;
		const integral = wd < 1e-12 ? s.lengthCm : -Math.expm1(-wd) / w;
		d += s.strength * Math.exp(uz - uBottom) * integral;
	}
	return Math.log(d);
}

/** The envelope band and path terms in the harmonic's frequency F = 2f. */
export function harmonicEnvelope(
	centerMhz: number,
	halfWidthMhz: number,
	steepness: number,
	weightExponent: number,
): Band {
	return {centerMhz: 2 * centerMhz, halfWidthMhz: 2 * halfWidthMhz, steepness, weightExponent, legs: 1};
}

/** One-way E(f) at f = F/2 twice plus E(F): the envelope's path, as coefficients of F^n. */
export function envelopeTerms(terms: PathTerms): PathTerms {
	return {
		exponents: terms.exponents,
		coefficients: terms.coefficients.map((c, j) => c * (1 + 2 ** (1 - terms.exponents[j]!))),
	};
}

export interface HarmonicLevel {
	/** ln of the received harmonic power (arbitrary reference). */
	readonly logPower: number;
	/** Power-weighted mean frequency of the received harmonic, MHz. */
	readonly centroidMhz: number;
}

/** The tissue harmonic of one probe band: received power at a depth, given the path to it. */
export class TissueHarmonicCalculator {
	private readonly envelope: Band;
	private lastPeak: number | undefined;

	constructor(
		private readonly centerMhz: number,
		halfWidthMhz: number,
		steepness: number,
		weightExponent: number,
	) {
		this.envelope = harmonicEnvelope(centerMhz, halfWidthMhz, steepness, weightExponent);
	}

	level(path: BuildUpPath): HarmonicLevel {
		const env = envelopeTerms(path.terms);
		if (this.envelope.halfWidthMhz === 0) {
			const F = 2 * this.centerMhz;
			let e = 0;
			env.exponents.forEach((n, j) => (e += env.coefficients[j]! * F ** n));
			const m = this.envelope.weightExponent;
			return {logPower: -(ln10 / 10) * e + m * Math.log(F) + 2 * logBuildUp(path, this.centerMhz), centroidMhz: F};
		}
		const r = bandLogMass(this.envelope, env, (F) => 2 * logBuildUp(path, F / 2), this.lastPeak);
		this.lastPeak = r.peak > 0 ? r.peak : undefined;
		return {logPower: r.logMass, centroidMhz: r.centroidMhz};
	}
}
