/**
 * The patient's own attenuation for one layer from the measured residual's depth course.
 *
 * Within the layer the residual (measured − expected level) is modelled as
 *   r_b = c + L(z_b; α) − L(z_b; α′),
 * c a free offset (the tissue's own echogenicity and the display's zero), L the engine's broadband
 * loss with its depth-dependent effective frequency (so the spectral downshift of Kuc 1984 is in
 * it: a narrowband straight line would read low), averaged over the band. α′ is found by a
 * Gauss–Newton iteration with c profiled out, weights 1/σ_b² from the speckle statistics. Its SD
 * comes from the least-squares curvature, inflated by the misfit when χ²/ν > 1; the 95 % interval
 * is ±t(ν)·SD with ν = bands − 2, because the band variances are themselves estimated from the image
 * (shared method notes §3).
 * Each band's model is its loss averaged at three depths (the loss is nearly linear over 1 cm).
 */
import {pathModelOf} from '../engine/compensation-curve.js';
import type {EnginePlan, Layer} from '../engine/types.js';
import {t95} from '../speckle/speckle-statistics.js';

export interface FitBand {
	readonly sampleDepthsCm: readonly number[];
	readonly residualDb: number;
	readonly sdDb: number;
}

export interface AttenuationEstimate {
	readonly alphaDbPerCmMhz: number;
	readonly sd: number;
	readonly low: number;
	readonly high: number;
	/** The fitted offset c, dB. */
	readonly offsetDb: number;
	/** χ² per degree of freedom of the fit. */
	readonly reducedChi2: number;
	/** Residual left after the model, per band, dB. */
	readonly leftoverDb: readonly number[];
}

export function withLayerAlpha(plan: EnginePlan, layerIndex: number, alpha: number): EnginePlan {
	const layers: Layer[] = plan.layers.map((l, i) =>
		i === layerIndex ? {...l, tissue: {...l.tissue, alphaDbPerCmMhz: alpha}} : l,
	);
	return {...plan, layers};
}

/** Mean loss over each band's sample depths with the layer at `alpha`, dB. */
function bandLosses(plan: EnginePlan, layerIndex: number, alpha: number, bands: readonly FitBand[]): number[] {
	const model = pathModelOf(withLayerAlpha(plan, layerIndex, alpha));
	return bands.map((b) => {
		let s = 0;
		for (const d of b.sampleDepthsCm) s += model.lossAt(d);
		return s / b.sampleDepthsCm.length;
	});
}

function profiled(r: readonly number[], m: readonly number[], w: readonly number[]): {c: number; ssr: number} {
	let sw = 0;
	let s = 0;
	for (let i = 0; i < r.length; i++) {
		sw += w[i]!;
		s += w[i]! * (r[i]! - m[i]!);
	}
	const c = s / sw;
	let ssr = 0;
	for (let i = 0; i < r.length; i++) ssr += w[i]! * (r[i]! - c - m[i]!) ** 2;
	return {c, ssr};
}

/** Fits α′ of `layerIndex`; needs at least three bands. */
export function fitLayerAttenuation(
	plan: EnginePlan,
	layerIndex: number,
	bands: readonly FitBand[],
	start?: number,
): AttenuationEstimate {
	const planAlpha = plan.layers[layerIndex]!.tissue.alphaDbPerCmMhz;
	const maxAlpha = Math.max(3, 6 * planAlpha);
	const base = bandLosses(plan, layerIndex, planAlpha, bands);
	const r = bands.map((b) => b.residualDb);
	const w = bands.map((b) => 1 / b.sdDb ** 2);
	const model = (alpha: number) => {
		const l = bandLosses(plan, layerIndex, alpha, bands);
		return l.map((x, i) => base[i]! - x);
	};
	// Gauss–Newton on α′ with the offset projected out: the model is nearly linear in α′, so a few
	// steps converge (the broadband curvature is what the iteration is for; shared notes C39).
	const h = 1e-3;
	let alpha = start ?? planAlpha;
	let m = model(alpha);
	let jac: number[] = [];
	let info = 0;
	for (let it = 0; it < 8; it++) {
		const up = model(alpha + h);
		jac = up.map((v, i) => (v - m[i]!) / h);
		let sw = 0;
		let sj = 0;
		let se = 0;
		for (let i = 0; i < jac.length; i++) {
			sw += w[i]!;
			sj += w[i]! * jac[i]!;
			se += w[i]! * (r[i]! - m[i]!);
		}
		const jBar = sj / sw;
		const eBar = se / sw;
		let num = 0;
		info = 0;
		for (let i = 0; i < jac.length; i++) {
			const jc = jac[i]! - jBar;
			num += w[i]! * jc * (r[i]! - m[i]! - eBar);
			info += w[i]! * jc * jc;
		}
		if (!(info > 0)) break;
		const next = Math.min(maxAlpha, Math.max(0, alpha + num / info));
		const done = Math.abs(next - alpha) < 1e-5;
		alpha = next;
		m = model(alpha);
		if (done) break;
	}
	const {c, ssr} = profiled(r, m, w);
	const dof = Math.max(1, bands.length - 2);
	const reducedChi2 = ssr / dof;
	const sd = Math.sqrt(Math.max(1, reducedChi2) / Math.max(info, 1e-12));
	return {
		alphaDbPerCmMhz: alpha,
		sd,
		low: Math.max(0, alpha - t95(dof) * sd),
		high: alpha + t95(dof) * sd,
		offsetDb: c,
		reducedChi2,
		leftoverDb: r.map((v, i) => v - c - m[i]!),
	};
}
