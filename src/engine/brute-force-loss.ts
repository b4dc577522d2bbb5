/**
 * A deliberately plain reference for the broadband loss: trapezoidal integration over a fine,
 * fixed frequency grid on f > 0, with its own depth mapping and its own sum over layers. It shares
 * no code with the fast path (path-model.ts, echo-spectrum.ts), so tests and the benchmark can hold
 * one against the other.
 */
import type {EnginePlan} from './types.js';

export interface BruteForceOptions {
	/** Frequency grid points. @default 20000 */
	readonly points?: number;
}

/** Each layer's thickness along the beam: d / cos θ with sin θ / c the same in every layer (Snell). */
function beamThickness(plan: EnginePlan): number[] {
	const angle = ((plan.probe.angleDeg ?? 0) * Math.PI) / 180;
	const c1 = plan.layers[0]!.tissue.speedMps;
	return plan.layers.map((l) => {
		const s = (Math.sin(angle) * l.tissue.speedMps) / c1;
		return s < 1 ? l.thicknessCm / Math.sqrt(1 - s * s) : l.thicknessCm;
	});
}

/** Per-layer path lengths along the beam for a displayed depth, found by walking the layers. */
function pathLengths(plan: EnginePlan, displayedCm: number): number[] {
	const c0 = plan.display.assumedSpeedMps;
	const lengths: number[] = [];
	const thickness = beamThickness(plan);
	let shownLeft = displayedCm;
	plan.layers.forEach((layer, i) => {
		const last = i === plan.layers.length - 1;
		const shownThickness = (thickness[i]! * c0) / layer.tissue.speedMps;
		const shownHere = last ? shownLeft : Math.min(shownLeft, shownThickness);
		lengths.push(Math.max(0, (shownHere * layer.tissue.speedMps) / c0));
		shownLeft -= Math.max(0, shownHere);
	});
	return lengths;
}

/** Per-layer path lengths down to a path length along the beam. */
function lengthsToTrue(plan: EnginePlan, trueCm: number): number[] {
	let top = 0;
	const thickness = beamThickness(plan);
	return plan.layers.map((_, i) => {
		const bottom = i === plan.layers.length - 1 ? Number.POSITIVE_INFINITY : top + thickness[i]!;
		const len = Math.max(0, Math.min(trueCm, bottom) - top);
		top = bottom;
		return len;
	});
}

/**
 * Tissue-harmonic attenuation by brute force: for each harmonic frequency F = 2f on a fixed grid,
 * the build-up ∫ β/(ρc³)·e^(−2·a(f, z') + a(2f, z')) dz' by the trapezoid rule (400 steps per layer),
 * times e^(−2·a(2f, z)) for the return, squared, over the probe's shape at 2·f0; relative to 1 cm.
 */
function bruteTissueHarmonic(plan: EnginePlan, displayedCm: readonly number[], points: number): number[] {
	const {centerMhz: f0, bandwidthFraction: b} = plan.probe;
	const p = plan.probe.spectrumSteepness ?? 2;
	const m = plan.scattererExponent;
	const half = b * f0; // half-width of the band at 2·f0
	const npPerDb = Math.log(10) / 20;
	const strength = plan.layers.map(
		(l) => (1 + (l.tissue.nonlinearityBA ?? 7) / 2) / (l.tissue.densityKgM3 * l.tissue.speedMps ** 3),
	);
	const oneWayNp = (lengths: number[], f: number) =>
		lengths.reduce(
			(e, len, i) => e + plan.layers[i]!.tissue.alphaDbPerCmMhz * f ** plan.layers[i]!.tissue.exponent * len,
			0,
		) * npPerDb;
	/** ln of the received harmonic power at F for a true depth. */
	const logPowerAt = (trueCm: number, F: number): number => {
		const f = F / 2;
		const lengths = lengthsToTrue(plan, trueCm);
		// ln of the build-up integral, by log-sum-exp over trapezoid nodes.
		const logs: number[] = [];
		let a1 = 0;
		let a2 = 0;
		lengths.forEach((len, i) => {
			if (len <= 0) return;
			const t = plan.layers[i]!.tissue;
			const r1 = t.alphaDbPerCmMhz * f ** t.exponent * npPerDb;
			const r2 = t.alphaDbPerCmMhz * F ** t.exponent * npPerDb;
			const steps = 400;
			const h = len / steps;
			for (let k = 0; k <= steps; k++) {
				const w = k === 0 || k === steps ? 0.5 : 1;
				logs.push(Math.log(w * h * strength[i]!) - 2 * (a1 + r1 * k * h) + (a2 + r2 * k * h));
			}
			a1 += r1 * len;
			a2 += r2 * len;
		});
		const top = Math.max(...logs);
		const logB = top + Math.log(logs.reduce((s, v) => s + Math.exp(v - top), 0));
		const shape = b === 0 ? 0 : -0.6 * Math.log(10) * (Math.abs(F - 2 * f0) / half) ** p;
		// Echo amplitude e^(−2·a(F, z))·B: the harmonic p2 = e^(−a(F, z))·B, then the way back.
		return shape + (m ? m * Math.log(F) : 0) + 2 * (logB - 2 * oneWayNp(lengths, F));
	};
	const logMass = (trueCm: number): number => {
		if (b === 0) return logPowerAt(trueCm, 2 * f0);
		const fMax = 2 * f0 + half * (200 / 6) ** (1 / p) + half * m;
		const h = fMax / points;
		const values: number[] = [];
		for (let i = 1; i <= points; i++) values.push(logPowerAt(trueCm, i * h));
		const top = Math.max(...values);
		return top + Math.log(values.reduce((s, v, i) => s + (i === points - 1 ? 0.5 : 1) * Math.exp(v - top), 0) * h);
	};
	const reference = logMass(1);
	return displayedCm.map((d) => {
		const lengths = pathLengths(plan, d);
		const trueCm = lengths.reduce((s, x) => s + x, 0);
		return (-10 / Math.log(10)) * (logMass(Math.max(trueCm, 0.1)) - reference);
	});
}

/** Round-trip attenuation (dB, interfaces excluded) at each displayed depth, by brute force. */
export function bruteForceAttenuationDb(
	plan: EnginePlan,
	displayedCm: readonly number[],
	options: BruteForceOptions = {},
): number[] {
	const points = options.points ?? 20000;
	if (plan.probe.receive === 'tissue-harmonic') return bruteTissueHarmonic(plan, displayedCm, points);
	const {centerMhz: f0, bandwidthFraction: b} = plan.probe;
	const harmonic = plan.probe.receive === 'scatterer-harmonic';
	const p = plan.probe.spectrumSteepness ?? 2;
	const m = plan.scattererExponent;
	// Half the −6 dB width of the pulse-echo amplitude spectrum.
	const half = (b * f0) / 2;
	const legs: {center: number; half: number; weight: number; passes: number}[] = harmonic
		? [
				{center: f0, half, weight: 0, passes: 1},
				{center: 2 * f0, half: 2 * half, weight: m, passes: 1},
			]
		: [{center: f0, half, weight: m, passes: 2}];

	return displayedCm.map((d) => {
		const lengths = pathLengths(plan, d);
		const oneWayDb = (f: number) => {
			let e = 0;
			plan.layers.forEach((l, i) => {
				e += l.tissue.alphaDbPerCmMhz * f ** l.tissue.exponent * lengths[i]!;
			});
			return e;
		};
		let total = 0;
		for (const leg of legs) {
			if (leg.half === 0) {
				total += leg.passes * oneWayDb(leg.center);
				continue;
			}
			// Far enough up that the spectrum has fallen by more than 200 dB of power.
			const fMax = leg.center + leg.half * (200 / 6) ** (1 / p) + leg.half * leg.weight;
			const h = fMax / points;
			// Log domain, so deep paths do not underflow to zero.
			const logAt = (f: number, withPath: boolean) =>
				-0.6 * Math.log(10) * (Math.abs(f - leg.center) / leg.half) ** p +
				(leg.weight ? leg.weight * Math.log(f) : 0) -
				(withPath ? (Math.log(10) / 10) * leg.passes * oneWayDb(f) : 0);
			const logIntegral = (withPath: boolean) => {
				const values: number[] = [];
				for (let i = 0; i <= points; i++) values.push(logAt(i === 0 ? 1e-12 : i * h, withPath));
				const peak = Math.max(...values);
				let s = 0;
				values.forEach((v, i) => {
					s += (i === 0 || i === points ? 0.5 : 1) * Math.exp(v - peak);
				});
				return peak + Math.log(s * h);
			};
			total += (-10 / Math.log(10)) * (logIntegral(true) - logIntegral(false));
		}
		return total;
	});
}
