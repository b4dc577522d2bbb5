/**
 * The attenuation fit against the broadband worked case of the shared method notes (C39): because
 * the echo spectrum slides down with depth (Kuc 1984, IEEE Trans ASSP 32(1):1–6), a narrowband
 * straight line through the residual reads a deep attenuation change far too low; the fit through
 * the engine's broadband loss recovers it.
 */
import {describe, expect, it} from 'vitest';
import {bandSampleDepths} from '../../src/analysis/applied-gain.js';
import {fitLayerAttenuation, withLayerAlpha} from '../../src/analysis/attenuation-fit.js';
import {pathModelOf} from '../../src/engine/compensation-curve.js';
import {bandwidthForSigma, custom, plan as buildPlan} from '../helpers/plans.js';

// C39: 3.5 MHz, power-spectrum σ 0.6317 MHz; plan 0.5 dB/cm/MHz throughout, truth 0.8 below 7.2 cm.
const tissue = custom('uniform test medium', 1540, 1060, 0.5, 1);
const plan = buildPlan(
	[
		{tissue, thicknessCm: 7.2},
		{tissue, thicknessCm: 20},
	],
	{centerMhz: 3.5, bandwidthFraction: bandwidthForSigma(3.5, 0.6317)},
);
const truth = withLayerAlpha(plan, 1, 0.8);
const planLoss = pathModelOf(plan);
const trueLoss = pathModelOf(truth);

describe('C39: broadband fit of a deep attenuation change', () => {
	it('uniform 0.5 → 0.8: the residual at 10 cm is 13.834 dB, a narrowband reading of 0.198 (Kuc 1984 downshift)', () => {
		const uniformTruth = withLayerAlpha(withLayerAlpha(plan, 0, 0.8), 1, 0.8);
		const residual = pathModelOf(uniformTruth).lossAt(10) - planLoss.lossAt(10);
		expect(residual).toBeCloseTo(13.834, 2);
		expect(residual / (2 * 3.5 * 10)).toBeCloseTo(0.198, 3);
	});

	// Bands 8–12.5 cm, noise-free residual = expected − measured loss difference.
	const edges = [8, 9, 10, 11, 12, 12.5];
	const bands = edges.slice(0, -1).map((top, i) => {
		const depths = bandSampleDepths(top, edges[i + 1]!);
		const mean = (f: (d: number) => number) => depths.reduce((s, d) => s + f(d), 0) / depths.length;
		return {sampleDepthsCm: depths, residualDb: mean((d) => planLoss.lossAt(d) - trueLoss.lossAt(d)), sdDb: 0.1};
	});

	it('a straight narrowband line through the residual reads Δα ≈ 0.18, not 0.30 (C39: 0.181)', () => {
		const xs = bands.map((b) => b.sampleDepthsCm.reduce((s, d) => s + d, 0) / b.sampleDepthsCm.length);
		const ys = bands.map((b) => b.residualDb);
		const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
		const my = ys.reduce((a, b) => a + b, 0) / ys.length;
		let sxy = 0;
		let sxx = 0;
		xs.forEach((x, i) => {
			sxy += (x - mx) * (ys[i]! - my);
			sxx += (x - mx) ** 2;
		});
		const lineDelta = -sxy / sxx / (2 * 3.5);
		expect(lineDelta).toBeGreaterThan(0.17);
		expect(lineDelta).toBeLessThan(0.2);
	});

	it('the iterated broadband fit recovers Δα = 0.300 (C39) with an interval that holds it', () => {
		const fit = fitLayerAttenuation(plan, 1, bands);
		expect(fit.alphaDbPerCmMhz).toBeCloseTo(0.8, 3);
		expect(fit.low).toBeLessThan(0.8);
		expect(fit.high).toBeGreaterThan(0.8);
		for (const l of fit.leftoverDb) expect(Math.abs(l)).toBeLessThan(0.01);
	});

	it('halving every band SD halves the reported SD (precision scales with the speckle statistics)', () => {
		const a = fitLayerAttenuation(plan, 1, bands);
		const b = fitLayerAttenuation(
			plan,
			1,
			bands.map((x) => ({...x, sdDb: x.sdDb / 2})),
		);
		expect(b.sd / a.sd).toBeCloseTo(0.5, 3);
	});
});
