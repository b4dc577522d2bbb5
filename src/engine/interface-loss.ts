/**
 * Loss at a boundary between two media, from their impedances Z = ρ·c (normal incidence).
 * Intensity reflection R = ((Z2 − Z1)/(Z2 + Z1))², the same from either side; an echo from
 * beyond crosses the boundary twice, so its round-trip transmission loss is −10·log10((1 − R)²).
 */
import {impedanceMrayl} from './tissue-library.js';
import type {Tissue} from './types.js';

/** Above this reflected fraction the boundary is treated as a barrier (soft tissue/bone R ≈ 0.37,
 * soft tissue/lung ≈ 0.5, soft tissue/air ≈ 0.999, while soft-tissue pairs stay below 0.05).
 * The threshold itself is common practice, no source. */
export const barrierReflection = 0.1;

/** Intensity reflection coefficient R between two media. */
export function reflectionCoefficient(
	a: Pick<Tissue, 'speedMps' | 'densityKgM3'>,
	b: Pick<Tissue, 'speedMps' | 'densityKgM3'>,
): number {
	const z1 = impedanceMrayl(a);
	const z2 = impedanceMrayl(b);
	const r = (z2 - z1) / (z2 + z1);
	return r * r;
}

/** Round-trip transmission loss of crossing a boundary with reflection R, dB. */
export function roundTripTransmissionLossDb(reflection: number): number {
	const t = 1 - reflection;
	return t <= 0 ? Number.POSITIVE_INFINITY : -20 * Math.log10(t);
}
