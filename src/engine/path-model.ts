/**
 * The echo loss of one layer stack at any displayed depth: power-law attenuation over the probe's
 * spectrum plus the transmission loss of every boundary crossed, both round trip.
 */
import {BandLossCalculator, probeBands, type PathTerms} from './echo-spectrum.js';
import {criticalAngleDeg, layersAlongBeam, obliqueRoundTripLossDb, refractedAnglesDeg} from './beam-angle.js';
import {barrierReflection, reflectionCoefficient, roundTripTransmissionLossDb} from './interface-loss.js';
import {displayedDepthOf, layerSpans, spanAtDisplayed, trueDepthAt, type LayerSpan} from './layer-geometry.js';
import {
	buildUpStrength,
	harmonicNearFieldFloorCm,
	harmonicReferenceCm,
	TissueHarmonicCalculator,
	type BuildUpPath,
	type BuildUpSegment,
} from './tissue-harmonic.js';
import {smoothAlong, type Pair} from './smooth-along-depth.js';
import type {EnginePlan, Layer, ReceiveMode} from './types.js';

/** One-way α0 (dB/cm/MHzⁿ) at or above which a layer is an absorber that shadows everything
 * beyond it at diagnostic frequencies (bone ≥ 13, lung 40; tendon 1.3). Common practice, no source. */
export const absorberAlpha = 5;

export interface PathPoint {
	readonly trueDepthCm: number;
	readonly layerIndex: number;
	readonly attenuationDb: number;
	readonly interfaceLossDb: number;
	readonly echoCenterMhz: number;
}

/**
 * The fields of {@link PathPoint} for many depths, one array per field: what a curve reads from
 * every depth without an object each (a row of a protocol table asks for ~160 depths; those objects
 * lived through the fit and were the costliest part of a row's garbage).
 */
export interface PathColumns {
	readonly trueDepthCm: number[];
	readonly layerIndex: number[];
	readonly attenuationDb: number[];
	readonly interfaceLossDb: number[];
	readonly echoCenterMhz: number[];
}

/** Empty columns with room for `count` depths. */
export function pathColumns(count: number): PathColumns {
	return {
		trueDepthCm: new Array(count),
		layerIndex: new Array(count),
		attenuationDb: new Array(count),
		interfaceLossDb: new Array(count),
		echoCenterMhz: new Array(count),
	};
}

/** Writes one point into columns at `i`. */
export function putPoint(c: PathColumns, i: number, p: PathPoint): void {
	c.trueDepthCm[i] = p.trueDepthCm;
	c.layerIndex[i] = p.layerIndex;
	c.attenuationDb[i] = p.attenuationDb;
	c.interfaceLossDb[i] = p.interfaceLossDb;
	c.echoCenterMhz[i] = p.echoCenterMhz;
}

/** Columns as one object per depth. */
export function pointsOf(c: PathColumns): PathPoint[] {
	return c.trueDepthCm.map((trueDepthCm, i) => ({
		trueDepthCm,
		layerIndex: c.layerIndex[i]!,
		attenuationDb: c.attenuationDb[i]!,
		interfaceLossDb: c.interfaceLossDb[i]!,
		echoCenterMhz: c.echoCenterMhz[i]!,
	}));
}

/** Loss (dB) and centroid (MHz) tolerances of the depth interpolant: 10× below the quadrature's own
 * accuracy against the brute force (0.001 dB, see the engine tests). */
const alongDepthTolerance: Pair = [1e-4, 1e-4];

/** A boundary or layer past which no useful echo returns. */
export interface Barrier {
	readonly kind: 'strong-reflector' | 'strong-absorber';
	readonly displayedCm: number;
	readonly layerIndex: number;
	/** Reflected intensity fraction (reflector) or α0 (absorber). */
	readonly value: number;
	/** Set when the beam's angle is past the boundary's critical angle (total reflection), degrees. */
	readonly criticalAngleDeg?: number;
}

export class PathModel {
	readonly spans: LayerSpan[];
	private readonly exponents: number[];
	/** Per layer: one-way dB coefficients per exponent accumulated above its top. */
	private readonly termsAtTop: number[][];
	/** Per layer: round-trip interface loss accumulated above its top, dB. */
	private readonly interfaceAtTop: number[];
	private readonly bands: BandLossCalculator[];
	/** Tissue-harmonic receive: the build-up calculator and its level at the reference depth. */
	private readonly harmonic: {calculator: TissueHarmonicCalculator; referenceLogPower: number} | null = null;
	readonly receive: ReceiveMode;
	readonly barrier: Barrier | null;

	constructor(
		layers: readonly Layer[],
		probe: EnginePlan['probe'],
		scattererExponent: number,
		assumedSpeedMps: number,
	) {
		const angleDeg = probe.angleDeg ?? 0;
		const angles = refractedAnglesDeg(layers, angleDeg);
		// Thickness along the beam (d / cos θ): the path, and the displayed depth, run along it.
		this.spans = layerSpans(layersAlongBeam(layers, angleDeg), assumedSpeedMps);
		this.exponents = [...new Set(layers.map((l) => l.tissue.exponent))];
		this.receive = probe.receive ?? 'fundamental';
		this.bands = probeBands(
			probe.centerMhz,
			probe.bandwidthFraction,
			scattererExponent,
			this.receive === 'scatterer-harmonic',
			probe.spectrumSteepness,
		).map((b) => new BandLossCalculator(b));
		this.termsAtTop = [];
		this.interfaceAtTop = [];
		let terms = this.exponents.map(() => 0);
		let iface = 0;
		let barrier: Barrier | null = null;
		this.spans.forEach((span, i) => {
			this.termsAtTop.push(terms);
			this.interfaceAtTop.push(iface);
			const t = span.layer.tissue;
			if (!barrier && t.alphaDbPerCmMhz >= absorberAlpha) {
				barrier = {kind: 'strong-absorber', displayedCm: span.shownTopCm, layerIndex: i, value: t.alphaDbPerCmMhz};
			}
			const below = this.spans[i + 1];
			if (!below) return;
			terms = [...terms];
			terms[this.exponents.indexOf(t.exponent)]! += t.alphaDbPerCmMhz * span.layer.thicknessCm;
			const incidence = angles[i] ?? 90;
			if (angles[i + 1] === null) {
				// Past the critical angle: total reflection, nothing crosses; everything beyond is held.
				if (!barrier) {
					const critical = criticalAngleDeg(t, below.layer.tissue) ?? 90;
					barrier = {
						kind: 'strong-reflector',
						displayedCm: span.shownBottomCm,
						layerIndex: i + 1,
						value: 1,
						criticalAngleDeg: critical,
					};
				}
				return;
			}
			const r = reflectionCoefficient(t, below.layer.tissue);
			iface +=
				angleDeg === 0 ? roundTripTransmissionLossDb(r) : obliqueRoundTripLossDb(t, below.layer.tissue, incidence);
			if (!barrier && r >= barrierReflection) {
				barrier = {kind: 'strong-reflector', displayedCm: span.shownBottomCm, layerIndex: i + 1, value: r};
			}
		});
		this.barrier = barrier;
		if (this.receive === 'tissue-harmonic') {
			const calculator = new TissueHarmonicCalculator(
				probe.centerMhz,
				(probe.bandwidthFraction * probe.centerMhz) / 2,
				probe.spectrumSteepness ?? 2,
				scattererExponent,
			);
			const referenceLogPower = calculator.level(this.buildUpPathAt(harmonicReferenceCm)).logPower;
			this.harmonic = {calculator, referenceLogPower};
		}
	}

	/** The layers crossed down to a true depth, for the harmonic build-up. */
	private buildUpPathAt(trueCm: number): BuildUpPath {
		const span = this.spans.find((s) => trueCm <= s.trueBottomCm) ?? this.spans[this.spans.length - 1]!;
		const terms = this.termsAt(span, trueCm);
		const segments: BuildUpSegment[] = [];
		for (const s of this.spans) {
			if (s.index > span.index) break;
			const t = s.layer.tissue;
			const last = s.index === span.index;
			segments.push({
				strength: buildUpStrength(t),
				lengthCm: (last ? trueCm : s.trueBottomCm) - s.trueTopCm,
				alphaDbPerCmMhz: t.alphaDbPerCmMhz,
				exponent: t.exponent,
				bottom: last ? terms.coefficients : this.termsAtTop[s.index + 1]!,
			});
		}
		return {terms, segments};
	}

	/** Displayed depth the fit and the penetration search start from: below the harmonic's build-up
	 * reference for tissue-harmonic receive, the skin otherwise. */
	get referenceDisplayedCm(): number {
		return this.harmonic ? displayedDepthOf(this.spans, harmonicReferenceCm) : 0;
	}

	/** One-way path terms to a true depth inside a given span. */
	private termsAt(span: LayerSpan, trueCm: number): PathTerms {
		const coefficients = [...this.termsAtTop[span.index]!];
		const t = span.layer.tissue;
		coefficients[this.exponents.indexOf(t.exponent)]! += t.alphaDbPerCmMhz * (trueCm - span.trueTopCm);
		return {exponents: this.exponents, coefficients};
	}

	/** Everything the echo from a reference scatterer at this displayed depth has been through. */
	at(displayedCm: number): PathPoint {
		const span = spanAtDisplayed(this.spans, displayedCm);
		const trueCm = trueDepthAt(span, displayedCm);
		const terms = this.termsAt(span, trueCm);
		let attenuationDb = 0;
		let echoCenterMhz = 0;
		if (this.harmonic) {
			const level = this.harmonic.calculator.level(this.buildUpPathAt(Math.max(trueCm, harmonicNearFieldFloorCm)));
			return {
				trueDepthCm: trueCm,
				layerIndex: span.index,
				attenuationDb: (-10 / Math.log(10)) * (level.logPower - this.harmonic.referenceLogPower),
				interfaceLossDb: this.interfaceAtTop[span.index]!,
				echoCenterMhz: level.centroidMhz,
			};
		}
		for (const band of this.bands) {
			const l = band.loss(terms);
			attenuationDb += l.lossDb;
			echoCenterMhz = l.centroidMhz;
		}
		return {
			trueDepthCm: trueCm,
			layerIndex: span.index,
			attenuationDb,
			interfaceLossDb: this.interfaceAtTop[span.index]!,
			echoCenterMhz,
		};
	}

	/**
	 * {@link at} for many displayed depths at once, for the price of far fewer integrals: within a
	 * layer that holds many of them, the broadband attenuation and centroid (the tissue harmonic's
	 * level and centroid too, deeper than its near-field floor) come from a checked Chebyshev interpolant
	 * along depth (smooth-along-depth.ts), within 1e-4 dB and 1e-4 MHz.
	 */
	pointsAt(displayedCm: readonly number[]): PathPoint[] {
		return pointsOf(this.columnsAt(displayedCm));
	}

	/** {@link pointsAt} as columns (the same numbers). */
	columnsAt(displayedCm: readonly number[]): PathColumns {
		const count = displayedCm.length;
		const out = pathColumns(count);
		if (!this.harmonic && !this.bands.some((b) => b.broadband)) {
			for (let i = 0; i < count; i++) putPoint(out, i, this.at(displayedCm[i]!));
			return out;
		}
		// Worked out shallow to deep; the depths come so already (sample depths), else sorted here.
		let ascending = true;
		for (let i = 1; i < count && ascending; i++) ascending = displayedCm[i - 1]! <= displayedCm[i]!;
		const order = ascending ? null : displayedCm.map((_, i) => i).sort((a, b) => displayedCm[a]! - displayedCm[b]!);
		const sorted = order ? order.map((i) => displayedCm[i]!) : displayedCm;
		const at = order ? pathColumns(count) : out;
		let start = 0;
		while (start < count) {
			const span = spanAtDisplayed(this.spans, sorted[start]!);
			let end = start + 1;
			while (end < count && spanAtDisplayed(this.spans, sorted[end]!) === span) end++;
			// The tissue harmonic is held at its near-field floor above it (a corner): those few depths exactly.
			let near = start;
			while (this.harmonic && near < end && trueDepthAt(span, sorted[near]!) <= harmonicNearFieldFloorCm) {
				const v = this.exactIn(span, sorted[near]!);
				at.attenuationDb[near] = v[0];
				at.echoCenterMhz[near] = v[1];
				near++;
			}
			smoothAlong(
				(d) => this.exactIn(span, d),
				sorted.slice(near, end),
				alongDepthTolerance,
				{first: at.attenuationDb, second: at.echoCenterMhz},
				near,
			);
			const iface = this.interfaceAtTop[span.index]!;
			for (let k = start; k < end; k++) {
				at.trueDepthCm[k] = trueDepthAt(span, sorted[k]!);
				at.layerIndex[k] = span.index;
				at.interfaceLossDb[k] = iface;
			}
			start = end;
		}
		if (order) {
			for (let k = 0; k < count; k++) {
				const i = order[k]!;
				out.trueDepthCm[i] = at.trueDepthCm[k]!;
				out.layerIndex[i] = at.layerIndex[k]!;
				out.attenuationDb[i] = at.attenuationDb[k]!;
				out.interfaceLossDb[i] = at.interfaceLossDb[k]!;
				out.echoCenterMhz[i] = at.echoCenterMhz[k]!;
			}
		}
		return out;
	}

	/** Attenuation (dB) and surviving centroid (MHz) at a displayed depth inside `span`, exactly. */
	private exactIn(span: LayerSpan, displayedCm: number): Pair {
		if (this.harmonic) {
			const p = this.at(displayedCm);
			return [p.attenuationDb, p.echoCenterMhz];
		}
		const terms = this.termsAt(span, trueDepthAt(span, displayedCm));
		let attenuationDb = 0;
		let echoCenterMhz = 0;
		for (const band of this.bands) {
			const l = band.loss(terms);
			attenuationDb += l.lossDb;
			echoCenterMhz = l.centroidMhz;
		}
		return [attenuationDb, echoCenterMhz];
	}

	/** Total round-trip loss at a displayed depth, dB. */
	lossAt(displayedCm: number): number {
		const p = this.at(displayedCm);
		return p.attenuationDb + p.interfaceLossDb;
	}

	/**
	 * Displayed depth where the loss first reaches `budgetDb`, searched up to `maxCm` to within
	 * 1e-5 cm; null if it never does. The fundamental loss only grows with depth, so a bracket on
	 * [0, maxCm] is safe. The tissue harmonic's falls first (build-up) and then grows, so the search
	 * starts at its reference depth and steps down to the first crossing to bracket it. Inside the
	 * bracket, false-position steps with the Illinois correction (Dowell & Jarratt 1971, from memory)
	 * take ~6 loss evaluations where halving took ~21, and a halving step whenever the bracket has not
	 * halved in two steps keeps the jumps at boundaries (interface losses) from slowing it.
	 */
	depthForLoss(budgetDb: number, maxCm: number, near?: DepthHint): number | null {
		let lo = 0;
		let hi = maxCm;
		let fLo: number;
		let fHi: number;
		const bracket = this.harmonic || !near ? null : this.bracketNear(budgetDb, maxCm, near);
		if (bracket) {
			({lo, hi, fLo, fHi} = bracket);
		} else if (this.harmonic) {
			const start = Math.min(this.referenceDisplayedCm, maxCm);
			let crossed = false;
			fLo = Number.NaN;
			fHi = Number.NaN;
			for (let d = start; d < maxCm + 0.25; d += 0.25) {
				const x = Math.min(d, maxCm);
				const f = this.lossAt(x) - budgetDb;
				if (f > 0) {
					hi = x;
					fHi = f;
					crossed = true;
					break;
				}
				lo = x;
				fLo = f;
			}
			if (!crossed) return null;
			if (hi === start) return start;
		} else {
			fHi = this.lossAt(maxCm) - budgetDb;
			if (fHi <= 0) return null;
			fLo = this.lossAt(0) - budgetDb;
		}
		let replaced: 'lo' | 'hi' | undefined;
		let before = Infinity;
		let twoBefore = Infinity;
		while (hi - lo > 1e-5) {
			const width = hi - lo;
			const halve = width > twoBefore / 2 || !(fLo < 0);
			let x = halve ? (lo + hi) / 2 : lo + (width * -fLo) / (fHi - fLo);
			// Never on or too near an end, or the bracket would not shrink.
			const margin = Math.min(2.5e-6, width / 4);
			x = Math.min(Math.max(x, lo + margin), hi - margin);
			const f = this.lossAt(x) - budgetDb;
			if (f > 0) {
				if (replaced === 'hi') fLo /= 2;
				hi = x;
				fHi = f;
				replaced = 'hi';
			} else {
				if (replaced === 'lo') fHi /= 2;
				lo = x;
				fLo = f;
				replaced = 'lo';
			}
			twoBefore = before;
			before = width;
		}
		return (lo + hi) / 2;
	}

	/**
	 * A bracket of the crossing near a hint, for the monotone (non-harmonic) loss only: a given
	 * bracket is checked with one exact loss at each end; a guess is widened from both sides by
	 * doubling steps. With one crossing any bracket leads to it, so the answer is the same to the
	 * search's 1e-5 cm; a bracket that does not hold is dropped (null: search the whole range).
	 */
	private bracketNear(
		budgetDb: number,
		maxCm: number,
		near: DepthHint,
	): {lo: number; hi: number; fLo: number; fHi: number} | null {
		const f = (d: number) => this.lossAt(d) - budgetDb;
		if ('loCm' in near) {
			const lo = Math.max(0, near.loCm);
			const hi = Math.min(maxCm, near.hiCm);
			if (!(lo < hi)) return null;
			const fHi = f(hi);
			if (!(fHi > 0)) return null;
			const fLo = f(lo);
			return fLo <= 0 ? {lo, hi, fLo, fHi} : null;
		}
		const guess = Math.min(Math.max(near.guessCm, 0), maxCm);
		if (!Number.isFinite(guess)) return null;
		const fGuess = f(guess);
		let step = Math.max(0.02, 0.02 * guess);
		if (fGuess > 0) {
			let hi = guess;
			let fHi = fGuess;
			for (;;) {
				const lo = Math.max(0, hi - step);
				const fLo = f(lo);
				if (fLo <= 0) return {lo, hi, fLo, fHi};
				if (lo === 0) return null;
				hi = lo;
				fHi = fLo;
				step *= 2;
			}
		}
		if (guess >= maxCm) return null;
		let lo = guess;
		let fLo = fGuess;
		for (;;) {
			const hi = Math.min(maxCm, lo + step);
			const fHi = f(hi);
			if (fHi > 0) return {lo, hi, fLo, fHi};
			if (hi === maxCm) return null;
			lo = hi;
			fLo = fHi;
			step *= 2;
		}
	}
}

/** Where a noise-floor crossing is likely: a bracket (displayed cm) or a single guess. */
export type DepthHint = {readonly loCm: number; readonly hiCm: number} | {readonly guessCm: number};
