/**
 * The generalized spectrum shape (probe.spectrumSteepness): the fast path against the brute-force
 * reference for every shape, the Gaussian special case, and the published shape comparison.
 */
import {describe, expect, it} from 'vitest';
import {bruteForceAttenuationDb} from '../../src/engine/brute-force-loss.js';
import {pathModelOf, sampleDepths} from '../../src/engine/compensation-curve.js';
import {logSpectrum, steepnessForBandwidth} from '../../src/engine/echo-spectrum.js';
import type {EnginePlan} from '../../src/engine/types.js';
import {matched, plan, tissue} from '../helpers/plans.js';

const dB = (np: number) => (10 / Math.log(10)) * np;

/** Layered, several exponents, scatterer f^1.4: the shapes must agree with brute force here too. */
function layered(steepness: number, bandwidthFraction: number, harmonic = false): EnginePlan {
	const p = plan(
		[
			{tissue: tissue('skin'), thicknessCm: 0.2},
			{tissue: tissue('fat'), thicknessCm: 3},
			{tissue: tissue('muscle'), thicknessCm: 1.5},
			{tissue: tissue('liver'), thicknessCm: 8},
			{tissue: tissue('spleen'), thicknessCm: 20},
		],
		{centerMhz: 3.5, bandwidthFraction, depthCm: 24},
	);
	return {
		...p,
		scattererExponent: 1.4,
		probe: {...p.probe, receive: harmonic ? 'scatterer-harmonic' : 'fundamental', spectrumSteepness: steepness},
	};
}

describe('spectrum shape |H(f)| = 10^(−(6/20)·|2(f − f0)/(B·f0)|^p)', () => {
	it('is −6 dB at f0 ± B·f0/2 for every steepness (the definition in the issue; Garcia 2022 uses −6.02 dB)', () => {
		for (const p of [1, 2, 3.7, 10]) {
			expect(dB(logSpectrum(3.5 + 1.05, 3.5, 1.05, p))).toBeCloseTo(-6, 10);
			expect(dB(logSpectrum(3.5 - 1.05, 3.5, 1.05, p))).toBeCloseTo(-6, 10);
		}
	});

	it(
		'p = 2 is the Gaussian exp(−(f − f0)²/(2σ²)) with σ = B·f0/3.3245 (the −6 dB half-width of a Gaussian, Kuc 1984 ' +
			'model; derived)',
		() => {
			const sigma = (0.6 * 3.5) / (2 * Math.sqrt(1.2 * Math.log(10)));
			for (const f of [0.5, 2, 3.5, 6])
				expect(logSpectrum(f, 3.5, 1.05, 2)).toBeCloseTo(-((f - 3.5) ** 2) / (2 * sigma * sigma), 12);
		},
	);

	it('the Gaussian at 0 MHz with B = 60 % is −66.7 dB (−66.9 with the −6.02 dB form; derived, case C49)', () => {
		expect(dB(logSpectrum(0, 1, 0.3, 2))).toBeCloseTo(-66.67, 2);
	});

	it(
		'steepness from a −6 dB bandwidth: p = ln126/ln(2/B) = 4.017 / 5.278 / 6.977 for 60 / 80 ' +
			'/ 100 % (Garcia 2022, from memory; case C49)',
		() => {
			expect(steepnessForBandwidth(0.6)).toBeCloseTo(4.017, 3);
			expect(steepnessForBandwidth(0.8)).toBeCloseTo(5.278, 3);
			expect(steepnessForBandwidth(1.0)).toBeCloseTo(6.977, 3);
			expect(steepnessForBandwidth(1.5)).toBe(10);
		},
	);
});

describe('fast path against the brute-force reference for every shape', () => {
	const depths = sampleDepths(24, 1.5);
	for (const harmonic of [false, true]) {
		for (const p of [1, 1.5, 2, 3, 5, 7, 10]) {
			for (const b of [0.3, 1.2]) {
				it(`${harmonic ? 'harmonic' : 'fundamental'}, p = ${p}, B = ${b}: within 0.001 dB (the benchmark holds 0.05 dB)`, () => {
					const pl = layered(p, b, harmonic);
					const m = pathModelOf(pl);
					const fast = depths.map((d) => m.at(d).attenuationDb);
					const ref = bruteForceAttenuationDb(pl, depths, {points: 8000});
					fast.forEach((v, i) => expect(Math.abs(v - ref[i]!)).toBeLessThan(0.001));
				});
			}
		}
	}
});

describe('steep skirts against the Gaussian (shared reference §8, case C50: simulator of Garcia 2022, from memory)', () => {
	// The simulator's window is −6.02 dB (exp(−ln2·x^p)) at the half-width; ours is −6 dB, so its
	// half-width is narrowed by (0.3·ln10/ln2)^(1/p) to describe the same spectrum.
	const sameWindow = (b: number, p: number) => b * ((0.3 * Math.log(10)) / Math.log(2)) ** (1 / p);
	const loss = (f0: number, b: number, p: number, z: number) => {
		const pl = plan([{tissue: matched('phantom 0.5', 1540, 0.5), thicknessCm: 40}], {
			centerMhz: f0,
			bandwidthFraction: sameWindow(b, p),
			depthCm: 20,
		});
		return pathModelOf({...pl, probe: {...pl.probe, spectrumSteepness: p}}).at(z).attenuationDb;
	};
	const cases: [number, number, number, number][] = [
		[2.5, 0.8, 16, 32.79],
		[2.5, 0.8, 20, 39.84],
		[3.5, 0.6, 16, 47.92],
		[3.5, 0.6, 20, 58.49],
		[3.5, 1.0, 16, 39.89],
		[3.5, 1.0, 20, 47.9],
	];
	for (const [f0, b, z, simulated] of cases) {
		it(`${f0} MHz, ${b * 100} %, ${z} cm: steep window within 0.5 dB of the simulator's ${simulated} dB and above the Gaussian`, () => {
			const p = steepnessForBandwidth(b);
			const steep = loss(f0, b, p, z);
			expect(Math.abs(steep - simulated)).toBeLessThan(0.5);
			// The Gaussian's low-frequency tail makes it optimistic (less loss) at depth.
			expect(steep - loss(f0, b, 2, z)).toBeGreaterThan(1.5);
		});
	}

	it('the steep window costs more than the Gaussian the deeper the echo (shared reference §8)', () => {
		const excess = [4, 8, 12, 16, 20].map((z) => loss(3.5, 0.6, steepnessForBandwidth(0.6), z) - loss(3.5, 0.6, 2, z));
		for (let i = 1; i < excess.length; i++) expect(excess[i]!).toBeGreaterThan(excess[i - 1]!);
		expect(excess[0]!).toBeLessThan(0.5);
	});
});
