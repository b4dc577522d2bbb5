/**
 * The uncertainty band against the brute-force reference (src/engine/brute-force-loss.ts, which shares
 * no code with the fast path) run at every corner of the tissues' published spreads: the band must hold
 * the true envelope of the loss over those corners.
 *
 * Basis: the power law α(f) = α0·fⁿ of the tissue tables (Duck 1990, Physical Properties of Tissue,
 * ch. 4; Szabo 2004, Diagnostic Ultrasound Imaging, ch. 4; both from memory): fⁿ grows with n above
 * 1 MHz and shrinks with n below it, so which exponent end is the lossier one depends on where the
 * echo's spectrum lies. Boundary transmission at normal incidence T = 4·Z1·Z2/(Z1 + Z2)² (Kinsler,
 * Frey, Coppens & Sanders 2000, Fundamentals of Acoustics, 4th ed., ch. 6; from memory).
 */
import {describe, expect, it} from 'vitest';
import {bruteForceAttenuationDb} from '../../src/engine/brute-force-loss.js';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import type {CurveResult, EnginePlan, Layer, ReceiveMode, Tissue} from '../../src/engine/types.js';
import {bandScopeNote} from '../../src/engine/uncertainty-band.js';
import {plan, tissue} from '../helpers/plans.js';

/** Every corner of a tissue's attenuation and speed spread (α0 at least ±20 %, Madsen et al. 1986), with the exponent's middle too. */
function attenuationCorners(t: Tissue): Tissue[] {
	const [a0, a1] = t.spread?.alphaDbPerCmMhz ?? [t.alphaDbPerCmMhz, t.alphaDbPerCmMhz];
	const as = [Math.min(a0, t.alphaDbPerCmMhz * 0.8), Math.max(a1, t.alphaDbPerCmMhz * 1.2)];
	const [n0, n1] = t.spread?.exponent ?? [t.exponent, t.exponent];
	const ns = [...new Set([n0, (n0 + n1) / 2, n1])];
	const cs = t.spread?.speedMps ?? [t.speedMps, t.speedMps];
	return as.flatMap((alphaDbPerCmMhz) =>
		ns.flatMap((exponent) => cs.map((speedMps) => ({...t, alphaDbPerCmMhz, exponent, speedMps}))),
	);
}

/** Every combination of the layers' corners. */
function layerCorners(layers: readonly Layer[]): Layer[][] {
	return layers.reduce<Layer[][]>(
		(acc, l) => acc.flatMap((prefix) => attenuationCorners(l.tissue).map((t) => [...prefix, {...l, tissue: t}])),
		[[]],
	);
}

/** Brute-force attenuation envelope over all corners, dB, at each depth. */
function bruteEnvelope(p: EnginePlan, depths: number[], points: number): {low: number[]; high: number[]} {
	const runs = layerCorners(p.layers).map((layers) => bruteForceAttenuationDb({...p, layers}, depths, {points}));
	return {
		low: depths.map((_, k) => Math.min(...runs.map((r) => r[k]!))),
		high: depths.map((_, k) => Math.max(...runs.map((r) => r[k]!))),
	};
}

const sampleAt = (r: CurveResult, d: number) => r.samples.find((s) => Math.abs(s.displayedDepthCm - d) < 1e-9)!;

function liverAlone(centerMhz: number, bandwidthFraction: number, receive: ReceiveMode): EnginePlan {
	const p = plan([{tissue: tissue('liver'), thicknessCm: 40}], {centerMhz, bandwidthFraction, depthCm: 30});
	return {...p, probe: {...p.probe, receive}};
}

describe('the exponent end follows the echo, not f0 (α = α0·fⁿ; liver n 1.0–1.2, from memory)', () => {
	const depths = [2, 5, 10, 15, 20, 25, 30];
	const p = liverAlone(1.5, 1.0, 'fundamental');
	const r = computeCurve(p, {stepCm: 0.5});
	const env = bruteEnvelope(p, depths, 8000);

	it('a 1.5 MHz probe at 100 % bandwidth: the echo centre falls below 1 MHz from about 10 cm down', () => {
		expect(sampleAt(r, 5).echoCenterMhz).toBeGreaterThan(1);
		expect(sampleAt(r, 15).echoCenterMhz).toBeLessThan(1);
		expect(sampleAt(r, 30).echoCenterMhz).toBeLessThan(0.5);
	});

	it('the band holds the brute-force envelope over every corner at every depth (within 0.01 dB) and is no wider than it (0.05 dB)', () => {
		depths.forEach((d, k) => {
			const s = sampleAt(r, d);
			expect(s.lowDb).toBeLessThanOrEqual(env.low[k]! + 0.01);
			expect(s.highDb).toBeGreaterThanOrEqual(env.high[k]! - 0.01);
			expect(env.low[k]! - s.lowDb).toBeLessThan(0.05);
			expect(s.highDb - env.high[k]!).toBeLessThan(0.05);
		});
	});

	it('the rule it replaces (exponent end from f0 ≥ 1 MHz) would miss the envelope by over 1 dB at 30 cm', () => {
		const liver = tissue('liver');
		// The old low end: α0 low, the smaller exponent, the nominal speed.
		const old = {...liver, alphaDbPerCmMhz: 0.4, exponent: 1};
		const oldLow = bruteForceAttenuationDb({...p, layers: [{tissue: old, thicknessCm: 40}]}, [30], {points: 8000})[0]!;
		expect(oldLow - env.low[6]!).toBeGreaterThan(1);
	});
});

describe('harmonic receive: the band holds the brute-force envelope too', () => {
	it('scatterer harmonic, 1 MHz at 80 %: within 0.01 dB at 5–30 cm', () => {
		const depths = [5, 15, 30];
		const p = liverAlone(1, 0.8, 'scatterer-harmonic');
		const r = computeCurve(p, {stepCm: 0.5});
		const env = bruteEnvelope(p, depths, 8000);
		depths.forEach((d, k) => {
			expect(sampleAt(r, d).lowDb).toBeLessThanOrEqual(env.low[k]! + 0.01);
			expect(sampleAt(r, d).highDb).toBeGreaterThanOrEqual(env.high[k]! - 0.01);
		});
	});

	it(
		'tissue harmonic, 0.8 MHz at 80 %: in the near field the build-up gains while ' +
			'attenuation loses, both held (within the 0.02 dB of a coarse brute-force grid)',
		() => {
			const depths = [2, 25];
			const p = liverAlone(0.8, 0.8, 'tissue-harmonic');
			const r = computeCurve(p, {stepCm: 0.5});
			const env = bruteEnvelope(p, depths, 1000);
			depths.forEach((d, k) => {
				expect(sampleAt(r, d).lowDb).toBeLessThanOrEqual(env.low[k]! + 0.02);
				expect(sampleAt(r, d).highDb).toBeGreaterThanOrEqual(env.high[k]! - 0.02);
			});
		},
	);
});

describe('tissue harmonic near the skin: the band where the build-up bends the curve', () => {
	// The build-up grows as z, so the loss goes as about -20·log10(z) (Cobb 1983, quasi-linear
	// plane-wave solution, from memory): between 0.15 and 2.25 cm the build-up gains 23.5 dB, less
	// the attenuation; the curve bends most near the skin. Samples between the old 0.5 cm points are where interpolation missed.
	it(
		'liver, 2.5 MHz at 60 %: at 0.05 cm samples over the first 2.5 cm the band holds the brute-force envelope over ' +
			'every corner (within 0.02 dB) and is no wider than it (0.05 dB)',
		() => {
			const base = plan([{tissue: tissue('liver'), thicknessCm: 40}], {
				centerMhz: 2.5,
				bandwidthFraction: 0.6,
				depthCm: 6,
			});
			const p: EnginePlan = {...base, probe: {...base.probe, receive: 'tissue-harmonic'}};
			const depths = [0.15, 0.25, 0.35, 0.45, 0.65, 0.85, 1.25, 1.75, 2.25];
			const r = computeCurve(p, {stepCm: 0.05});
			const env = bruteEnvelope(p, depths, 2000);
			expect(env.high[0]! - env.high[8]!).toBeGreaterThan(8);
			depths.forEach((d, k) => {
				const s = sampleAt(r, d);
				expect(s.lowDb).toBeLessThanOrEqual(env.low[k]! + 0.02);
				expect(s.highDb).toBeGreaterThanOrEqual(env.high[k]! - 0.02);
				expect(env.low[k]! - s.lowDb).toBeLessThan(0.05);
				expect(s.highDb - env.high[k]!).toBeLessThan(0.05);
			});
		},
	);
});

describe('tissue harmonic over two layers: each layer at its own corner', () => {
	it(
		'fat 3 cm over liver, 2 MHz at 60 %, p = 4: holds the envelope over all 8 × 8 per-layer ' +
			'corners, boundary range added below it (within 0.02 dB)',
		() => {
			const layers: Layer[] = [
				{tissue: tissue('fat'), thicknessCm: 3},
				{tissue: tissue('liver'), thicknessCm: 30},
			];
			const base = plan(layers, {centerMhz: 2, bandwidthFraction: 0.6, depthCm: 16});
			const p: EnginePlan = {...base, probe: {...base.probe, receive: 'tissue-harmonic', spectrumSteepness: 4}};
			const depths = [0.5, 16];
			const r = computeCurve(p, {stepCm: 0.5});
			const ends = (t: Tissue) =>
				attenuationCorners(t).filter((c) => c.exponent !== (t.spread!.exponent![0] + t.spread!.exponent![1]) / 2);
			const runs = ends(layers[0]!.tissue).flatMap((a) =>
				ends(layers[1]!.tissue).map((b) =>
					bruteForceAttenuationDb(
						{
							...p,
							layers: [
								{...layers[0]!, tissue: a},
								{...layers[1]!, tissue: b},
							],
						},
						depths,
						{points: 600},
					),
				),
			);
			// Fat/liver boundary: 0.038–0.409 dB round trip (Kinsler et al. 2000; worked out below).
			depths.forEach((d, k) => {
				const below = d > 3.5;
				const s = sampleAt(r, d);
				expect(s.lowDb).toBeLessThanOrEqual(Math.min(...runs.map((x) => x[k]!)) + (below ? 0.038 : 0) + 0.02);
				expect(s.highDb).toBeGreaterThanOrEqual(Math.max(...runs.map((x) => x[k]!)) + (below ? 0.409 : 0) - 0.02);
			});
		},
	);
});

describe('speed and density spreads reach the band through depth mapping and the boundary', () => {
	// Fat over liver at normal incidence, 3.5 MHz, 60 %.
	const layers: Layer[] = [
		{tissue: tissue('fat'), thicknessCm: 4},
		{tissue: tissue('liver'), thicknessCm: 30},
	];
	const p = plan(layers, {centerMhz: 3.5, bandwidthFraction: 0.6, depthCm: 16});
	const r = computeCurve(p, {stepCm: 0.5});
	const depths = [2, 6, 10, 16];
	const env = bruteEnvelope(p, depths, 4000);

	/** Round-trip boundary loss over the corners of both layers' speed and density ranges (Kinsler et al. 2000). */
	const boundary = (() => {
		const zs = (t: Tissue) => {
			const cs = t.spread?.speedMps ?? [t.speedMps, t.speedMps];
			const rs = t.spread?.densityKgM3 ?? [t.densityKgM3, t.densityKgM3];
			return cs.flatMap((c) => rs.map((rho) => c * rho));
		};
		const losses = zs(layers[0]!.tissue).flatMap((z1) =>
			zs(layers[1]!.tissue).map((z2) => -20 * Math.log10((4 * z1 * z2) / (z1 + z2) ** 2)),
		);
		return {low: Math.min(...losses), high: Math.max(...losses)};
	})();

	it('fat (Z 1.15–1.43 MRayl) and liver (1.63–1.77) never match: the boundary costs 0.038–0.409 dB round trip (R = 0.0044–0.046)', () => {
		expect(boundary.low).toBeCloseTo(0.038, 3);
		expect(boundary.high).toBeCloseTo(0.409, 3);
	});

	it(
		'above the boundary the band is the attenuation envelope; ' +
			"below it, the envelope plus the boundary's own range (within 0.01 dB)",
		() => {
			depths.forEach((d, k) => {
				const s = sampleAt(r, d);
				// The spread fat is drawn 3.6–3.9 cm thick (1412–1488 m/s): at 2 cm every corner is above the boundary.
				const below = d > 4.5;
				const low = env.low[k]! + (below ? boundary.low : 0);
				const high = env.high[k]! + (below ? boundary.high : 0);
				expect(s.lowDb).toBeLessThanOrEqual(low + 0.01);
				expect(s.highDb).toBeGreaterThanOrEqual(high - 0.01);
				expect(low - s.lowDb).toBeLessThan(0.05);
				expect(s.highDb - high).toBeLessThan(0.05);
			});
		},
	);

	it('the speed spread alone widens the band: with each speed pinned the band is narrower at 16 cm', () => {
		const pinned = plan(
			layers.map((l) => ({
				...l,
				tissue: {...l.tissue, spread: {...l.tissue.spread, speedMps: undefined, densityKgM3: undefined}},
			})),
			{centerMhz: 3.5, bandwidthFraction: 0.6, depthCm: 16},
		);
		const a = sampleAt(r, 16);
		const b = sampleAt(computeCurve(pinned, {stepCm: 0.5}), 16);
		expect(a.highDb - a.lowDb).toBeGreaterThan(b.highDb - b.lowDb + 0.5);
	});
});

describe('what the band holds is said in one sentence', () => {
	it('names the spreads it includes and what it leaves out', () => {
		for (const word of [
			'attenuation',
			'speed',
			'density',
			'centre frequency',
			'not included',
			'thickness',
			'beam angle',
		])
			expect(bandScopeNote).toContain(word);
	});
});
