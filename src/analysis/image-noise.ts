/**
 * The noise level as the image itself shows it, for refining without a scanner profile (whose
 * probe-in-air image would otherwise give it). Noise rides on the delivered gain; tissue echoes
 * fall with the path loss. So within one layer the residual (measured − the plan's expected
 * level) of band b is modelled as the power sum
 *   r_b = 10·log10(10^((c + P_b − L_b(α))/10) + 10^((n + P_b)/10)),
 * P_b the plan's loss, L_b(α) the loss with the layer at α, c the tissue offset, n the noise
 * relative to the delivered gain. A grid over α and n (c by golden section) finds the best pair.
 * Bands whose level has stopped falling the way tissue echoes must are then read as noise
 * rather than trusting the plan's stated noise budget, which the scanner may not meet.
 */
import {pathModelOf} from '../engine/compensation-curve.js';
import type {EnginePlan} from '../engine/types.js';
import {withLayerAlpha} from './attenuation-fit.js';

export interface NoiseBand {
	readonly sampleDepthsCm: readonly number[];
	/** Measured − expected level, dB (expected = delivered − the plan's loss). */
	readonly residualDb: number;
	readonly sdDb: number;
}

export interface ImageNoise {
	/** Noise level relative to the delivered gain on the residual's scale, dB. */
	readonly noiseDb: number;
	/** True when the noise shows in the image: the noise term fits clearly better than tissue alone, and the
	deepest band's fitted echo-to-noise is below `seenBelowDb`. */
	readonly seen: boolean;
	/** Fitted echo-to-noise of the deepest band, dB. */
	readonly deepestEchoToNoiseDb: number;
}

/** Noise counts as seen when the deepest band's fitted echo-to-noise is below this, dB. */
export const seenBelowDb = 10;
/** χ² with one degree of freedom at 99.9 % (Abramowitz & Stegun 1964, table 26.8). */
const chi2Step = 10.83;
const alphaStep = 0.02;
const noiseStepDb = 0.5;

function meanLoss(model: ReturnType<typeof pathModelOf>, depths: readonly number[]): number {
	let s = 0;
	for (const d of depths) s += model.lossAt(d);
	return s / depths.length;
}

/** Null when fewer than four bands (three parameters need a spare band). */
export function imageNoiseLevel(plan: EnginePlan, layerIndex: number, bands: readonly NoiseBand[]): ImageNoise | null {
	if (bands.length < 4) return null;
	const planModel = pathModelOf(plan);
	const planLoss = bands.map((b) => meanLoss(planModel, b.sampleDepthsCm));
	const r = bands.map((b) => b.residualDb);
	const w = bands.map((b) => 1 / Math.max(b.sdDb, 0.05) ** 2);
	const planAlpha = plan.layers[layerIndex]!.tissue.alphaDbPerCmMhz;
	const maxAlpha = Math.max(2, 4 * planAlpha);
	// The noise can sit anywhere from well below the deepest tissue to the level of the deepest band.
	const low = Math.min(...r.map((v, i) => v - planLoss[i]!)) - 30;
	const high = Math.max(...r.map((v, i) => v - planLoss[i]!)) + 3;
	const rLow = Math.min(...r);
	const rHigh = Math.max(...r);
	type Best = {cost: number; n: number; c: number; alpha: number; losses: number[]};
	let best: Best = {cost: Number.POSITIVE_INFINITY, n: low, c: 0, alpha: planAlpha, losses: planLoss};
	const search = (alphas: readonly number[], noises: readonly number[]) => {
		for (const alpha of alphas) {
			const model = pathModelOf(withLayerAlpha(plan, layerIndex, alpha));
			const losses = bands.map((b) => meanLoss(model, b.sampleDepthsCm));
			const tissue = losses.map((l, i) => planLoss[i]! - l);
			const tissuePower = tissue.map((t) => 10 ** (t / 10));
			for (const n of noises) {
				const noisePower = planLoss.map((p) => 10 ** ((n + p) / 10));
				const cost = (c: number) => {
					const cp = 10 ** (c / 10);
					let s = 0;
					for (let i = 0; i < r.length; i++)
						s += w[i]! * (r[i]! - 10 * Math.log10(cp * tissuePower[i]! + noisePower[i]!)) ** 2;
					return s;
				};
				// c lies within the residuals' span (the tissue term dominates somewhere).
				let a = rLow - 10 - Math.max(...tissue);
				let b = rHigh + 10 - Math.min(...tissue);
				for (let k = 0; k < 30; k++) {
					const m1 = a + (b - a) * 0.382;
					const m2 = a + (b - a) * 0.618;
					if (cost(m1) < cost(m2)) b = m2;
					else a = m1;
				}
				const c = (a + b) / 2;
				const value = cost(c);
				if (value < best.cost) best = {cost: value, n, c, alpha, losses};
			}
		}
	};
	const steps = (from: number, to: number, step: number) =>
		Array.from({length: Math.floor((to - from) / step + 1e-9) + 1}, (_, k) => from + k * step);
	// Coarse, then fine around the coarse best.
	search(steps(0, maxAlpha, 5 * alphaStep), steps(low, high, 4 * noiseStepDb));
	const coarse = best;
	// The same fit with the noise far below every band: what tissue alone explains.
	best = {...best, cost: Number.POSITIVE_INFINITY};
	search(steps(0, maxAlpha, alphaStep), [low - 100]);
	const tissueOnly = best;
	best = coarse;
	search(
		steps(Math.max(0, coarse.alpha - 5 * alphaStep), Math.min(maxAlpha, coarse.alpha + 5 * alphaStep), alphaStep),
		steps(Math.max(low, coarse.n - 4 * noiseStepDb), Math.min(high, coarse.n + 4 * noiseStepDb), noiseStepDb),
	);
	const last = bands.length - 1;
	const deepestEchoToNoiseDb = best.c + planLoss[last]! - best.losses[last]! - (best.n + planLoss[last]!);
	// Seen only when the noise term explains the level course clearly better than tissue alone
	// (a likelihood-ratio step of χ²₁ at 99.9 %, scaled by the misfit left).
	const scale = Math.max(1, best.cost / Math.max(1, bands.length - 3));
	const better = tissueOnly.cost - best.cost > chi2Step * scale;
	return {noiseDb: best.n, seen: better && deepestEchoToNoiseDb < seenBelowDb, deepestEchoToNoiseDb};
}
