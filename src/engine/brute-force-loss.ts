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

/** True depth and per-layer true path lengths for a displayed depth, found by walking the layers. */
function pathLengths(plan: EnginePlan, displayedCm: number): number[] {
	const c0 = plan.display.assumedSpeedMps;
	const lengths: number[] = [];
	let shownLeft = displayedCm;
	plan.layers.forEach((layer, i) => {
		const last = i === plan.layers.length - 1;
		const shownThickness = (layer.thicknessCm * c0) / layer.tissue.speedMps;
		const shownHere = last ? shownLeft : Math.min(shownLeft, shownThickness);
		lengths.push(Math.max(0, (shownHere * layer.tissue.speedMps) / c0));
		shownLeft -= Math.max(0, shownHere);
	});
	return lengths;
}

/** Round-trip attenuation (dB, interfaces excluded) at each displayed depth, by brute force. */
export function bruteForceAttenuationDb(plan: EnginePlan, displayedCm: readonly number[], options: BruteForceOptions = {}): number[] {
	const points = options.points ?? 20000;
	const {centerMhz: f0, bandwidthFraction: b, harmonic} = plan.probe;
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
