/**
 * Properties the compensation engine must keep for any plan (fast-check), and the fast broadband
 * path held against the brute-force integration over frequency.
 */
import fc from 'fast-check';
import {describe, expect, it} from 'vitest';
import {bruteForceAttenuationDb} from '../../src/engine/brute-force-loss.js';
import {computeCurve, controlTargetDb, pathModelOf} from '../../src/engine/compensation-curve.js';
import {naiveFit} from '../../src/engine/slider-fit.js';
import type {EnginePlan, Layer} from '../../src/engine/types.js';
import {custom, plan} from '../helpers/plans.js';

/** Soft-tissue-like random layers (no barriers), 1–6 layers. */
const arbTissue = fc.record({
	speedMps: fc.double({min: 1400, max: 1800, noNaN: true}),
	densityKgM3: fc.double({min: 900, max: 1200, noNaN: true}),
	alphaDbPerCmMhz: fc.double({min: 0, max: 2, noNaN: true}),
	exponent: fc.double({min: 1, max: 2, noNaN: true}),
});
const arbLayers = fc
	.array(fc.record({tissue: arbTissue, thicknessCm: fc.double({min: 0.1, max: 8, noNaN: true})}), {
		minLength: 1,
		maxLength: 6,
	})
	.map((ls): Layer[] => ls.map((l, i) => ({tissue: {label: `t${i}`, ...l.tissue}, thicknessCm: l.thicknessCm})));
const arbProbe = fc.record({
	centerMhz: fc.double({min: 1, max: 15, noNaN: true}),
	bandwidthFraction: fc.oneof(fc.constant(0), fc.double({min: 0.05, max: 1.2, noNaN: true})),
	scattererExponent: fc.oneof(fc.constant(0), fc.double({min: 0, max: 4, noNaN: true})),
	receive: fc.constantFrom('fundamental' as const, 'tissue-harmonic' as const, 'scatterer-harmonic' as const),
});
const arbPlan = fc.record({layers: arbLayers, probe: arbProbe, depthCm: fc.double({min: 2, max: 30, noNaN: true})}).map(
	({layers, probe, depthCm}): EnginePlan =>
		plan(layers, {
			centerMhz: probe.centerMhz,
			bandwidthFraction: probe.bandwidthFraction,
			scattererExponent: probe.scattererExponent,
			depthCm,
			probe: {centerMhz: probe.centerMhz, bandwidthFraction: probe.bandwidthFraction, receive: probe.receive},
		}),
);

/** Plans whose loss only grows with depth: the tissue harmonic builds up first (dark near field),
 * so the monotone properties are for the other receive modes; tissue-harmonic.test.ts has its own. */
const arbMonotonePlan = arbPlan.filter((p) => p.probe.receive !== 'tissue-harmonic');

const runs = {numRuns: 60};

describe('engine properties', () => {
	it('splitting a layer in two changes nothing', () => {
		fc.assert(
			fc.property(arbPlan, fc.nat(5), fc.double({min: 0.05, max: 0.95, noNaN: true}), (p, pick, at) => {
				const i = pick % p.layers.length;
				const layer = p.layers[i]!;
				const isLast = i === p.layers.length - 1;
				const thickness = isLast ? 5 : layer.thicknessCm;
				const split: Layer[] = [
					...p.layers.slice(0, i),
					{tissue: layer.tissue, thicknessCm: thickness * at},
					{tissue: layer.tissue, thicknessCm: isLast ? layer.thicknessCm : thickness * (1 - at)},
					...p.layers.slice(i + 1),
				];
				const a = pathModelOf(p);
				const b = pathModelOf({...p, layers: split});
				for (const d of [0.3, p.display.depthCm / 3, p.display.depthCm]) {
					expect(b.lossAt(d)).toBeCloseTo(a.lossAt(d), 6);
				}
			}),
			runs,
		);
	});

	it('a lossless, impedance-matched stand-off at the assumed speed only shifts the curve by its thickness', () => {
		fc.assert(
			fc.property(arbMonotonePlan, fc.double({min: 0.2, max: 3, noNaN: true}), (p, t) => {
				const first = p.layers[0]!.tissue;
				const z = first.speedMps * first.densityKgM3;
				const pad = custom('matched pad', 1540, z / 1540, 0);
				const a = pathModelOf(p);
				const b = pathModelOf({...p, layers: [{tissue: pad, thicknessCm: t}, ...p.layers]});
				for (const d of [0, 1, p.display.depthCm / 2]) expect(b.lossAt(d + t)).toBeCloseTo(a.lossAt(d), 6);
			}),
			runs,
		);
	});

	it('compensation never decreases with depth', () => {
		fc.assert(
			fc.property(arbMonotonePlan, (p) => {
				const r = computeCurve(p, {stepCm: 0.25});
				for (let i = 1; i < r.samples.length; i++) {
					expect(r.samples[i]!.compensationDb).toBeGreaterThanOrEqual(r.samples[i - 1]!.compensationDb - 1e-9);
					expect(r.samples[i]!.lowDb).toBeLessThanOrEqual(r.samples[i]!.compensationDb + 1e-9);
					expect(r.samples[i]!.highDb).toBeGreaterThanOrEqual(r.samples[i]!.compensationDb - 1e-9);
				}
			}),
			runs,
		);
	});

	it('narrowband limit: one layer loses exactly 2·α0·fⁿ·z', () => {
		fc.assert(
			fc.property(
				arbTissue,
				fc.double({min: 0.5, max: 20, noNaN: true}),
				fc.double({min: 1, max: 20, noNaN: true}),
				(t, f, d) => {
					const p = plan([{tissue: {label: 'x', ...t}, thicknessCm: 30}], {
						centerMhz: f,
						bandwidthFraction: 0,
						depthCm: 30,
					});
					const at = pathModelOf(p).at(d);
					expect(at.attenuationDb).toBeCloseTo(2 * t.alphaDbPerCmMhz * f ** t.exponent * at.trueDepthCm, 8);
				},
			),
			runs,
		);
	});

	it('a very narrow band tends to the narrowband value', () => {
		const p = (b: number) =>
			plan([{tissue: custom('liver-like', 1578, 1060, 0.5, 1.1), thicknessCm: 30}], {
				centerMhz: 3.5,
				bandwidthFraction: b,
			});
		const nb = pathModelOf(p(0)).lossAt(10);
		expect(pathModelOf(p(0.01)).lossAt(10)).toBeCloseTo(nb, 2);
	});

	it(
		'for linear-in-f tissue the loss depends only on Σβ·d: reordering layers keeps the final ' +
			'loss (derived: the broadband loss depends on the layers only through Σβ·d)',
		() => {
			const a = {tissue: custom('a', 1540, 1039, 0.6), thicknessCm: 3};
			const b = {tissue: custom('b', 1540, 1039, 1.0), thicknessCm: 2};
			const tail = {tissue: custom('c', 1540, 1039, 0.5), thicknessCm: 30};
			const p1 = plan([a, b, tail], {bandwidthFraction: 0.8});
			const p2 = plan([b, a, tail], {bandwidthFraction: 0.8});
			expect(pathModelOf(p1).lossAt(12)).toBeCloseTo(pathModelOf(p2).lossAt(12), 9);
		},
	);

	it("the fitted sliders never do worse than the naive fit that samples each slider's depth", () => {
		fc.assert(
			fc.property(
				arbPlan,
				fc.constantFrom('band-centres' as const, 'band-edges' as const),
				fc.integer({min: 2, max: 12}),
				(p, knots, count) => {
					const q = {...p, sliders: {...p.sliders, knots, count}};
					const r = computeCurve(q, {stepCm: 0.2});
					const naive = naiveFit({
						depthsCm: r.samples.map((s) => s.displayedDepthCm),
						targetDb: r.samples.map((s) => controlTargetDb(q, s)),
						usableDepthCm: r.usableDepthCm,
						bank: q.sliders,
						displayDepthCm: q.display.depthCm,
						master: q.masterGain,
					});
					expect(r.fit.residualDb).toBeLessThanOrEqual(naive.residualDb + 1e-6);
				},
			),
			{numRuns: 40},
		);
	});
});

describe('fast broadband path against brute-force integration over f > 0', () => {
	it('agrees to 0.05 dB at every depth, including deep paths where the spectrum piles up near 0 MHz', () => {
		fc.assert(
			fc.property(arbMonotonePlan, (p) => {
				const depths = [0.5, p.display.depthCm / 4, p.display.depthCm / 2, p.display.depthCm];
				const model = pathModelOf(p);
				const reference = bruteForceAttenuationDb(p, depths, {points: 20000});
				depths.forEach((d, i) => {
					expect(Math.abs(model.at(d).attenuationDb - reference[i]!)).toBeLessThanOrEqual(0.05);
				});
			}),
			{numRuns: 25},
		);
	});

	it('holds for a deep, strongly attenuating broadband case (15 MHz, 120 % bandwidth, 30 cm of muscle)', () => {
		const p = plan([{tissue: custom('muscle', 1580, 1050, 0.96), thicknessCm: 40}], {
			centerMhz: 15,
			bandwidthFraction: 1.2,
			depthCm: 30,
		});
		const depths = [5, 15, 30];
		const reference = bruteForceAttenuationDb(p, depths, {points: 40000});
		const model = pathModelOf(p);
		depths.forEach((d, i) => expect(Math.abs(model.at(d).attenuationDb - reference[i]!)).toBeLessThanOrEqual(0.05));
	});
});
