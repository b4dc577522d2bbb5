/**
 * A beam crossing parallel layers at an angle: Snell's law at every boundary, the path through each
 * layer, the oblique transmission of each boundary, and where total reflection stops the beam.
 *
 * - Snell: sin θk / ck is the same in every layer (θ from the layer normal).
 * - A layer of thickness d is crossed along d / cos θk, so oblique beams lose more on the way; the
 *   scanner draws echoes along the beam, so the displayed depth is range along the beam.
 * - Fluid–fluid intensity transmission T = 4·Z1·Z2·cos θi·cos θt / (Z2·cos θi + Z1·cos θt)²; an echo from
 *   beyond crosses twice, so the round-trip loss is −20·log10 T (shared reference §9, from the standard
 *   fluid–fluid result; normal incidence gives back 1 − R).
 * - Going into faster tissue, beyond θc = asin(c1/c2) no energy crosses: a barrier.
 * Layers stay parallel; the angle is the one in the first layer.
 */
import {impedanceMrayl} from './tissue-library.js';
import type {Layer, Tissue} from './types.js';

const rad = Math.PI / 180;

/** Angle from the normal in each layer, degrees; null from the first layer the beam cannot enter. */
export function refractedAnglesDeg(layers: readonly Layer[], angleDeg: number): (number | null)[] {
	const first = layers[0]?.tissue.speedMps ?? 1540;
	const ray = Math.sin(angleDeg * rad) / first;
	let blocked = false;
	return layers.map((l) => {
		const s = ray * l.tissue.speedMps;
		if (blocked || s > 1) {
			blocked = true;
			return null;
		}
		return Math.asin(s) / rad;
	});
}

/** Critical angle going from a into b, degrees; null when b is not faster. */
export function criticalAngleDeg(a: Pick<Tissue, 'speedMps'>, b: Pick<Tissue, 'speedMps'>): number | null {
	return b.speedMps > a.speedMps ? Math.asin(a.speedMps / b.speedMps) / rad : null;
}

/** Intensity transmission through a boundary at incidence θi (fluid–fluid); 0 beyond the critical angle. */
export function obliqueTransmission(
	a: Pick<Tissue, 'speedMps' | 'densityKgM3'>,
	b: Pick<Tissue, 'speedMps' | 'densityKgM3'>,
	incidenceDeg: number,
): number {
	const st = (Math.sin(incidenceDeg * rad) * b.speedMps) / a.speedMps;
	if (st >= 1) return 0;
	const ci = Math.cos(incidenceDeg * rad);
	const ct = Math.sqrt(1 - st * st);
	const z1 = impedanceMrayl(a);
	const z2 = impedanceMrayl(b);
	const d = z2 * ci + z1 * ct;
	return (4 * z1 * z2 * ci * ct) / (d * d);
}

/** Round-trip loss of an oblique boundary, dB (Infinity beyond the critical angle). */
export function obliqueRoundTripLossDb(
	a: Pick<Tissue, 'speedMps' | 'densityKgM3'>,
	b: Pick<Tissue, 'speedMps' | 'densityKgM3'>,
	incidenceDeg: number,
): number {
	const t = obliqueTransmission(a, b, incidenceDeg);
	return t <= 0 ? Number.POSITIVE_INFINITY : -20 * Math.log10(t);
}

/**
 * The layers as the beam crosses them: each thickness becomes the path along the beam, d / cos θk.
 * Layers the beam cannot enter keep their thickness (nothing returns from them anyway).
 */
export function layersAlongBeam(layers: readonly Layer[], angleDeg: number): Layer[] {
	if (angleDeg === 0) return [...layers];
	const angles = refractedAnglesDeg(layers, angleDeg);
	return layers.map((l, i) => {
		const a = angles[i];
		return a === null || a === undefined ? l : {...l, thicknessCm: l.thicknessCm / Math.cos(a * rad)};
	});
}

/**
 * How far sideways of its true place a target is drawn, mm: the scanner draws it on the straight
 * line of the first layer's beam at the same path length, while the beam bent at every boundary.
 * `trueDepthCm` is depth normal to the layers. Speed errors along the beam are left out.
 */
export function lateralShiftMm(layers: readonly Layer[], angleDeg: number, trueDepthCm: number): number | null {
	const angles = refractedAnglesDeg(layers, angleDeg);
	let x = 0;
	let z = 0;
	for (let i = 0; i < layers.length && z < trueDepthCm; i++) {
		const a = angles[i];
		if (a === null || a === undefined) return null;
		const last = i === layers.length - 1;
		const d = Math.min(last ? Number.POSITIVE_INFINITY : layers[i]!.thicknessCm, trueDepthCm - z);
		x += d * Math.tan(a * rad);
		z += d;
	}
	const t1 = (angles[0] ?? 0) * rad;
	// Perpendicular distance of the true point from the drawn straight line.
	return Math.abs(x * Math.cos(t1) - z * Math.sin(t1)) * 10;
}
