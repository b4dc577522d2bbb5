/**
 * The echo loss of one layer stack at any displayed depth: power-law attenuation over the probe's
 * spectrum plus the transmission loss of every boundary crossed, both round trip.
 */
import {BandLossCalculator, probeBands, type PathTerms} from './echo-spectrum.js';
import {barrierReflection, reflectionCoefficient, roundTripTransmissionLossDb} from './interface-loss.js';
import {layerSpans, spanAtDisplayed, trueDepthAt, type LayerSpan} from './layer-geometry.js';
import type {EnginePlan, Layer} from './types.js';

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

/** A boundary or layer past which no useful echo returns. */
export interface Barrier {
	readonly kind: 'strong-reflector' | 'strong-absorber';
	readonly displayedCm: number;
	readonly layerIndex: number;
	/** Reflected intensity fraction (reflector) or α0 (absorber). */
	readonly value: number;
}

export class PathModel {
	readonly spans: LayerSpan[];
	private readonly exponents: number[];
	/** Per layer: one-way dB coefficients per exponent accumulated above its top. */
	private readonly termsAtTop: number[][];
	/** Per layer: round-trip interface loss accumulated above its top, dB. */
	private readonly interfaceAtTop: number[];
	private readonly bands: BandLossCalculator[];
	readonly barrier: Barrier | null;

	constructor(
		layers: readonly Layer[],
		probe: EnginePlan['probe'],
		scattererExponent: number,
		assumedSpeedMps: number,
	) {
		this.spans = layerSpans(layers, assumedSpeedMps);
		this.exponents = [...new Set(layers.map((l) => l.tissue.exponent))];
		this.bands = probeBands(probe.centerMhz, probe.bandwidthFraction, scattererExponent, probe.harmonic, probe.spectrumSteepness).map(
			(b) => new BandLossCalculator(b),
		);
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
			const r = reflectionCoefficient(t, below.layer.tissue);
			iface += roundTripTransmissionLossDb(r);
			if (!barrier && r >= barrierReflection) {
				barrier = {kind: 'strong-reflector', displayedCm: span.shownBottomCm, layerIndex: i + 1, value: r};
			}
		});
		this.barrier = barrier;
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

	/** Total round-trip loss at a displayed depth, dB. */
	lossAt(displayedCm: number): number {
		const p = this.at(displayedCm);
		return p.attenuationDb + p.interfaceLossDb;
	}

	/**
	 * Displayed depth where the loss first reaches `budgetDb`, searched up to `maxCm`; null if it
	 * never does. The loss only grows with depth, so bisection is safe.
	 */
	depthForLoss(budgetDb: number, maxCm: number): number | null {
		if (this.lossAt(maxCm) <= budgetDb) return null;
		let lo = 0;
		let hi = maxCm;
		while (hi - lo > 1e-5) {
			const mid = (lo + hi) / 2;
			if (this.lossAt(mid) > budgetDb) hi = mid;
			else lo = mid;
		}
		return (lo + hi) / 2;
	}
}
