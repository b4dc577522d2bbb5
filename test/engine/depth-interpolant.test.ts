/**
 * Many depths at once (PathModel.pointsAt): the loss and centroid come from a checked Chebyshev
 * interpolant along depth within each layer. Held against the plain brute-force integration (its own
 * frequency grid and depth walk, sharing no code) for every spectrum shape and both band layouts,
 * including a plan whose surviving spectrum piles up against 0 MHz, and against the exact per-depth
 * integral of the fast path itself.
 */
import {describe, expect, it} from 'vitest';
import {bruteForceAttenuationDb} from '../../src/engine/brute-force-loss.js';
import {pathModelOf, sampleDepths} from '../../src/engine/compensation-curve.js';
import type {EnginePlan} from '../../src/engine/types.js';
import {plan, tissue} from '../helpers/plans.js';

type Receive = NonNullable<EnginePlan['probe']['receive']>;

function layered(steepness: number, bandwidthFraction: number, centerMhz: number, receive: Receive): EnginePlan {
	const p = plan(
		[
			{tissue: tissue('skin'), thicknessCm: 0.2},
			{tissue: tissue('fat'), thicknessCm: 3},
			{tissue: tissue('muscle'), thicknessCm: 1.5},
			{tissue: tissue('liver'), thicknessCm: 8},
			{tissue: tissue('spleen'), thicknessCm: 20},
		],
		{centerMhz, bandwidthFraction, depthCm: 24},
	);
	return {...p, scattererExponent: 1.4, probe: {...p.probe, receive, spectrumSteepness: steepness}};
}

describe('losses at many depths through the interpolant along depth', () => {
	const depths = sampleDepths(24, 0.1);
	// 3.5 MHz as the engine's own brute-force tests; 10 MHz with a 120 % band piles the spectrum up
	// against 0 MHz well before 24 cm (the case the interpolant must split for).
	for (const [f0, b] of [
		[3.5, 0.6],
		[10, 1.2],
	] as const) {
		for (const receive of ['fundamental', 'scatterer-harmonic', 'tissue-harmonic'] as const) {
			for (const p of [1, 2, 10]) {
				const name = `${f0} MHz, B = ${b}, p = ${p}, ${receive}`;
				// The tissue harmonic's brute force integrates the build-up at every frequency and depth
				// (seconds per plan): the engine's tissue-harmonic tests and the bench hold it; here the
				// interpolant is held against the exact per-depth path.
				if (receive !== 'tissue-harmonic')
					it(`${name}: within 0.001 dB of the brute force (as the per-depth path is), between the nodes`, () => {
						const pl = layered(p, b, f0, receive);
						const fast = pathModelOf(pl)
							.pointsAt(depths)
							.map((x) => x.attenuationDb);
						// Every 7th of the 241 depths: most fall between the interpolant's nodes.
						const checked = depths.map((_, i) => i).filter((i) => i % 7 === 3);
						const ref = bruteForceAttenuationDb(
							pl,
							checked.map((i) => depths[i]!),
							{points: 8000},
						);
						checked.forEach((i, k) => expect(Math.abs(fast[i]! - ref[k]!)).toBeLessThan(0.001));
					});
				it(`${name}: within 1e-4 dB and 1e-4 MHz of the exact integral at every depth`, () => {
					const pl = layered(p, b, f0, receive);
					const many = pathModelOf(pl).pointsAt(depths);
					const one = pathModelOf(pl);
					depths.forEach((d, i) => {
						const exact = one.at(d);
						expect(Math.abs(many[i]!.attenuationDb - exact.attenuationDb)).toBeLessThan(1e-4);
						expect(Math.abs(many[i]!.echoCenterMhz - exact.echoCenterMhz)).toBeLessThan(1e-4);
						expect(many[i]!.layerIndex).toBe(exact.layerIndex);
						expect(many[i]!.interfaceLossDb).toBe(exact.interfaceLossDb);
					});
				});
			}
		}
	}

	it('keeps the order of depths it was given', () => {
		const pl = layered(2, 0.6, 3.5, 'fundamental');
		const shuffled = [12, 0.5, 3.3, 20, 0, 7.25, 3.2];
		const m = pathModelOf(pl);
		const many = m.pointsAt(shuffled);
		shuffled.forEach((d, i) => expect(many[i]!.trueDepthCm).toBeCloseTo(m.at(d).trueDepthCm, 12));
	});
});
