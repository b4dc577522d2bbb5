/**
 * The uncertainty band of a compensation curve: the loss at every displayed depth with each tissue's
 * values at the ends of their published spread, the lower end and the higher end.
 *
 * - Attenuation α(f) = α0·fⁿ (the power law of the tissue tables, e.g. Duck 1990 ch. 4, Szabo 2004
 *   ch. 4): more α0 always means more loss. A larger exponent n means more loss where the echo's
 *   frequencies lie above 1 MHz (fⁿ grows with n) and less where they lie below it, so the exponent
 *   end is picked at each depth from the echo's centre frequency there, not from the probe's f0: a
 *   deep broadband echo drifts below 1 MHz although f0 does not. Where the echo's frequencies
 *   straddle 1 MHz (the two legs of a harmonic echo), both exponent ends are worked out and the band
 *   keeps the lower and the higher loss.
 * - Speed: at a fixed displayed depth a faster layer is drawn thinner, so the echo there has crossed
 *   more true tissue, and every layer's loss per displayed cm rises with its speed; the low end takes
 *   each speed at the bottom of its range, the high end at the top.
 * - Tissue harmonic: levels are relative to the echo from 1 cm, so α0 and speed act either way in the
 *   near field and the layers over the reference act apart from those below (see cornersFor).
 * - Boundaries: each boundary's loss is taken at its own smallest and largest value over the corners
 *   of both layers' speed and density ranges (zero when their impedance ranges overlap at normal
 *   incidence); the sums bound the joint spread from outside.
 */
import {obliqueRoundTripLossDb, refractedAnglesDeg} from './beam-angle.js';
import {reflectionCoefficient, roundTripTransmissionLossDb} from './interface-loss.js';
import {PathModel, type PathPoint} from './path-model.js';
import {pointsAlongDepth} from './points-along-depth.js';
import {minimumAttenuationSpread} from './tissue-library.js';
import {harmonicReferenceCm} from './tissue-harmonic.js';
import type {EnginePlan, Layer, Range, Tissue} from './types.js';

/** What the band holds and what it leaves out: stated, from here, in every output that shows it. */
export const bandScopeNote =
	"Band: each tissue's published spread of attenuation (α0 at least ±20 %; the exponent's end chosen from the echo's " +
	'centre frequency at each depth, both ends for tissue harmonic), of speed (depth mapping and boundaries) and of ' +
	'density (boundaries); not included: errors in layer thickness, beam angle, probe frequency, bandwidth or spectrum ' +
	'shape, B/A, the noise budget, focusing and diffraction, or the scanner itself.';

export type BandEnd = 'low' | 'high';

/** Which exponent end raises the loss: `above` when the echo lies above 1 MHz (larger n = more loss). */
type ExponentSide = 'above' | 'below';

const rangeOf = (r: Range | undefined, value: number): Range => r ?? [value, value];

/** One corner of a tissue's spread: each value at its low or high end (the exponent by its size). */
export interface SpreadCorner {
	readonly alpha: BandEnd;
	readonly exponent: BandEnd;
	readonly speed: BandEnd;
	/** Tissue harmonic: α0 and speed of the layers over its reference depth, set apart from the rest. */
	readonly reference?: {readonly alpha: BandEnd; readonly speed: BandEnd};
}

/**
 * A tissue at one corner of its spread: α0 (at least ±20 %, Madsen et al. 1986), exponent and speed.
 * Density stays nominal: it acts only through the boundaries, which are bounded separately.
 */
export function spreadTissue(t: Tissue, corner: SpreadCorner): Tissue {
	const [aLo, aHi] = rangeOf(t.spread?.alphaDbPerCmMhz, t.alphaDbPerCmMhz);
	const [nLo, nHi] = rangeOf(t.spread?.exponent, t.exponent);
	const [cLo, cHi] = rangeOf(t.spread?.speedMps, t.speedMps);
	return {
		...t,
		alphaDbPerCmMhz:
			corner.alpha === 'low'
				? Math.min(aLo, t.alphaDbPerCmMhz * (1 - minimumAttenuationSpread))
				: Math.max(aHi, t.alphaDbPerCmMhz * (1 + minimumAttenuationSpread)),
		exponent: corner.exponent === 'low' ? Math.min(nLo, t.exponent) : Math.max(nHi, t.exponent),
		speedMps: corner.speed === 'low' ? Math.min(cLo, t.speedMps) : Math.max(cHi, t.speedMps),
	};
}

/** The four speed–density corners of a tissue's spread. */
function corners(t: Tissue): Pick<Tissue, 'speedMps' | 'densityKgM3'>[] {
	const [cLo, cHi] = rangeOf(t.spread?.speedMps, t.speedMps);
	const [rLo, rHi] = rangeOf(t.spread?.densityKgM3, t.densityKgM3);
	const cs = [Math.min(cLo, t.speedMps), Math.max(cHi, t.speedMps)];
	const rs = [Math.min(rLo, t.densityKgM3), Math.max(rHi, t.densityKgM3)];
	return cs.flatMap((speedMps) => rs.map((densityKgM3) => ({speedMps, densityKgM3})));
}

/** Impedance range of a tissue's spread (given as its corners), MRayl-proportional. */
function impedanceRange(cs: readonly Pick<Tissue, 'speedMps' | 'densityKgM3'>[]): Range {
	const zs = cs.map((c) => c.speedMps * c.densityKgM3);
	return [Math.min(...zs), Math.max(...zs)];
}

/**
 * Smallest and largest round-trip loss of each boundary (boundary i lies under layer i), dB, over the
 * speed and density corners of the two layers, at the nominal incidence angle. A corner past the
 * critical angle is left to the nominal barrier logic.
 */
export function boundaryLossRanges(layers: readonly Layer[], angleDeg: number): Range[] {
	const angles = refractedAnglesDeg(layers, angleDeg);
	const cornersOf = layers.map((l) => corners(l.tissue));
	const out: Range[] = [];
	for (let i = 0; i + 1 < layers.length; i++) {
		const a = layers[i]!.tissue;
		const b = layers[i + 1]!.tissue;
		const incidence = angles[i] ?? 0;
		const lossOf = (x: Pick<Tissue, 'speedMps' | 'densityKgM3'>, y: Pick<Tissue, 'speedMps' | 'densityKgM3'>) =>
			angleDeg === 0
				? roundTripTransmissionLossDb(reflectionCoefficient(x, y))
				: obliqueRoundTripLossDb(x, y, incidence);
		const ca = cornersOf[i]!;
		const cb = cornersOf[i + 1]!;
		const losses = ca.flatMap((x) => cb.map((y) => lossOf(x, y))).filter(Number.isFinite);
		const nominal = lossOf(a, b);
		const [za0, za1] = impedanceRange(ca);
		const [zb0, zb1] = impedanceRange(cb);
		const overlap = angleDeg === 0 && za0 <= zb1 && zb0 <= za1;
		out.push([overlap ? 0 : Math.min(nominal, ...losses), Math.max(nominal, ...losses)]);
	}
	return out;
}

/** Echo centre frequency (its lowest leg) from which on a larger exponent surely means more loss, MHz.
 * Not 1 MHz itself: f·ln f is convex, so a broad echo centred a little below 1 MHz still loses more
 * with a larger exponent; below this both ends are worked out. */
const surelyAboveMhz = 2;

/** Which exponent ends can raise the loss at a depth, from the echo's centre frequency there (a
 * harmonic echo's outward leg runs at about half its received centre). */
function exponentSides(receive: EnginePlan['probe']['receive'], centroidMhz: number): ExponentSide[] {
	const lowest = (receive ?? 'fundamental') === 'fundamental' ? centroidMhz : centroidMhz / 2;
	return lowest >= surelyAboveMhz ? ['above'] : ['above', 'below'];
}

/**
 * The corners a band end is taken over. Fundamental and scatterer harmonic: the loss rises with every
 * layer's α0 and speed, so all layers at the same end give the extreme: one corner per exponent side.
 * Tissue harmonic: relative to its 1 cm reference the near field's build-up gains with depth while
 * attenuation loses, so α0 and speed can act either way, and the speed of the layers over the
 * reference (which sets how deep the reference really is) acts apart from the speed below it: every
 * combination of α0, speed below and speed over the reference is tried. Above the reference the
 * exponent acts either way too (a larger one loses more between the depth and the reference, which
 * counts against the reference): both exponent ends are tried, whatever the echo's frequency. The
 * 16 corners are the same models for both band ends, each worked out once.
 */
function cornersFor(end: BandEnd, side: ExponentSide, tissueHarmonic: boolean): SpreadCorner[] {
	const lossier = (e: BandEnd): BandEnd => (side === 'above' ? e : e === 'low' ? 'high' : 'low');
	if (!tissueHarmonic) return [{alpha: end, exponent: lossier(end), speed: end}];
	const ends: BandEnd[] = ['low', 'high'];
	const pairs = ends.flatMap((alpha) => ends.map((speed) => ({alpha, speed})));
	return pairs.flatMap((deep) =>
		ends.flatMap((exponent) => ends.map((speed) => ({...deep, exponent, reference: {alpha: deep.alpha, speed}}))),
	);
}

/** Spacing of the band's grid, cm: away from the skin the band is smooth, so linear interpolation
 * between these points is far finer than the band itself. */
const bandGridCm = 0.5;

/**
 * The depths a plan's band is worked out at, given the curve's own samples (ascending). Every 0.5 cm
 * where the curve is smooth. The tissue harmonic's loss goes as about −20·log10(z) near the skin
 * (the build-up grows as z), whose second derivative 8.69/z² dB/cm² makes linear interpolation over
 * 0.5 cm err by up to h²/8 · 8.69/z²: 1.1 dB at 0.5 cm, 0.07 dB at 2 cm. So its band is worked out
 * at every sample of the curve, interpolated along depth per corner (points-along-depth.ts): that
 * costs about what the 0.5 cm grid with the near field filled in would.
 */
export function bandDepths(plan: EnginePlan, samples: readonly number[]): number[] {
	if (plan.probe.receive === 'tissue-harmonic') return [...samples];
	const depthCm = plan.display.depthCm;
	const coarse: number[] = [];
	for (let i = 0; i * bandGridCm < depthCm - 1e-9; i++) coarse.push(i * bandGridCm);
	coarse.push(depthCm);
	return coarse;
}

/** Loss tolerance of each corner's interpolant along depth, dB (and MHz for its centroid): 20×
 * below the 0.02 dB the band holds the per-corner envelope to. */
const cornerTolerance = 1e-3;

export interface UncertaintyBand {
	/** Band ends at a displayed depth, dB (not yet ordered against each other or the curve). */
	at(displayedCm: number): {lowDb: number; highDb: number};
}

/**
 * The band of a plan over its display. `centroidAt` gives the nominal echo's centre frequency at a
 * displayed depth; `grid` the depths the band is worked out at (interpolated linearly between).
 */
export function uncertaintyBand(
	plan: EnginePlan,
	grid: readonly number[],
	centroidAt: (displayedCm: number) => number,
): UncertaintyBand {
	const angle = plan.probe.angleDeg ?? 0;
	const boundaries = boundaryLossRanges(plan.layers, angle);
	const crossed = (end: BandEnd): number[] => {
		const sums = [0];
		for (const r of boundaries) sums.push(sums[sums.length - 1]! + (end === 'low' ? r[0] : r[1]));
		return sums;
	};
	const crossedBy = {low: crossed('low'), high: crossed('high')};
	const models = new Map<string, PathModel>();
	const modelOf = (c: SpreadCorner): PathModel => {
		const key = `${c.alpha}:${c.exponent}:${c.speed}:${c.reference?.alpha}:${c.reference?.speed}`;
		let m = models.get(key);
		if (!m) {
			let top = 0;
			const layers = plan.layers.map((l) => {
				const overReference = top < harmonicReferenceCm;
				top += l.thicknessCm;
				const corner = overReference && c.reference ? {...c, ...c.reference} : c;
				return {...l, tissue: spreadTissue(l.tissue, corner)};
			});
			m = new PathModel(layers, plan.probe, plan.scattererExponent, plan.display.assumedSpeedMps);
			models.set(key, m);
		}
		return m;
	};
	const tissueHarmonic = plan.probe.receive === 'tissue-harmonic';
	const xs = new Set(grid);
	// The boundaries of the spread layers, so steps in the boundary loss are not smeared.
	const last = grid[grid.length - 1] ?? 0;
	for (const speed of ['low', 'high'] as const) {
		for (const s of modelOf({alpha: speed, exponent: speed, speed}).spans)
			if (s.shownBottomCm < last) xs.add(s.shownBottomCm);
	}
	const depths = [...xs].sort((a, b) => a - b);
	// Which corners each end is taken over at each depth; each corner's model is then worked out once
	// over all the depths it is wanted at (interpolated along depth, checked), shared by both ends.
	// The corners depend on the depth only through its exponent sides: one set per distinct list.
	const cornerSets = new Map<string, {low: PathModel[]; high: PathModel[]; all: PathModel[]}>();
	const setOf = (sides: readonly ExponentSide[]) => {
		const key = sides.join();
		let set = cornerSets.get(key);
		if (!set) {
			const of = (end: BandEnd) =>
				sides.flatMap((side) => cornersFor(end, side, tissueHarmonic).map((corner) => modelOf(corner)));
			const low = of('low');
			const high = of('high');
			set = {low, high, all: [...new Set([...low, ...high])]};
			cornerSets.set(key, set);
		}
		return set;
	};
	const wanted = new Map<PathModel, number[]>();
	const cornersAt = depths.map((d, k) => {
		const sides: ExponentSide[] = tissueHarmonic ? ['above'] : exponentSides(plan.probe.receive, centroidAt(d));
		const set = setOf(sides);
		for (const m of set.all) {
			const at = wanted.get(m);
			if (at) at.push(k);
			else wanted.set(m, [k]);
		}
		return set;
	});
	// Each model's points, by depth index (only the depths it is wanted at are filled).
	const pointsOf = new Map<PathModel, PathPoint[]>();
	for (const [m, at] of wanted) {
		const points = pointsAlongDepth(
			m,
			at.map((k) => depths[k]!),
			[cornerTolerance, cornerTolerance],
		);
		const byDepth: PathPoint[] = new Array(depths.length);
		for (let i = 0; i < at.length; i++) byDepth[at[i]!] = points[i]!;
		pointsOf.set(m, byDepth);
	}
	const lowCrossed = crossedBy.low;
	const highCrossed = crossedBy.high;
	const ends = cornersAt.map((c, k) => {
		let lowDb = Infinity;
		for (const m of c.low) {
			const p = pointsOf.get(m)![k]!;
			lowDb = Math.min(lowDb, p.attenuationDb + lowCrossed[p.layerIndex]!);
		}
		let highDb = -Infinity;
		for (const m of c.high) {
			const p = pointsOf.get(m)![k]!;
			highDb = Math.max(highDb, p.attenuationDb + highCrossed[p.layerIndex]!);
		}
		return {lowDb, highDb};
	});
	return {
		at(d) {
			let i = 1;
			while (i < depths.length - 1 && depths[i]! < d) i++;
			const x0 = depths[i - 1] ?? 0;
			const x1 = depths[i] ?? x0;
			const e0 = ends[i - 1] ?? ends[0]!;
			const e1 = ends[i] ?? e0;
			const t = x1 > x0 ? Math.min(1, Math.max(0, (d - x0) / (x1 - x0))) : 0;
			return {lowDb: e0.lowDb + t * (e1.lowDb - e0.lowDb), highDb: e0.highDb + t * (e1.highDb - e0.highDb)};
		},
	};
}
