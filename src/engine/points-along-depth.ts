/**
 * A path model's points at many displayed depths for far fewer exact evaluations, in every receive
 * mode. PathModel.pointsAt already interpolates the broadband fundamental along depth; the tissue
 * harmonic's level it still works out pointwise. Here that level goes through the same checked
 * Chebyshev interpolant (smooth-along-depth.ts, within 1e-4 dB and 1e-4 MHz), piece by piece
 * inside one layer of the model, in ln(displayed depth): the build-up makes the loss go as about
 * −20·log10(z) near the skin, which bends sharply in depth but is nearly straight in ln z.
 */
import {spanAtDisplayed} from './layer-geometry.js';
import {type PathColumns, type PathModel, type PathPoint, pathColumns, pointsOf, putPoint} from './path-model.js';
import {smoothAlong, type Pair} from './smooth-along-depth.js';
import {harmonicNearFieldFloorCm} from './tissue-harmonic.js';

/** Loss (dB) and centroid (MHz) tolerances: those of PathModel.pointsAt. */
const pathTolerance: Pair = [1e-4, 1e-4];

/** `model.at` at every depth of `displayedCm` (ascending), the tissue harmonic interpolated along depth
 * within `tolerance`. */
export function pointsAlongDepth(
	model: PathModel,
	displayedCm: readonly number[],
	tolerance: Pair = pathTolerance,
): PathPoint[] {
	return pointsOf(columnsAlongDepth(model, displayedCm, tolerance));
}

/** {@link pointsAlongDepth} as columns (the same numbers, no object per depth). */
export function columnsAlongDepth(
	model: PathModel,
	displayedCm: readonly number[],
	tolerance: Pair = pathTolerance,
): PathColumns {
	if (model.receive !== 'tissue-harmonic') return model.columnsAt(displayedCm);
	const out = pathColumns(displayedCm.length);
	let start = 0;
	while (start < displayedCm.length) {
		const first = displayedCm[start]!;
		const span = spanAtDisplayed(model.spans, first);
		// Above the floor the level is held at the floor's (PathModel.at): one piece of its own.
		const held = (d: number) => span.trueTopCm + (d - span.shownTopCm) / span.stretch <= harmonicNearFieldFloorCm;
		const isHeld = held(first);
		let end = start + 1;
		while (end < displayedCm.length) {
			const d = displayedCm[end]!;
			if (spanAtDisplayed(model.spans, d) !== span || held(d) !== isHeld) break;
			end++;
		}
		if (isHeld || first <= 0) {
			for (let k = start; k < end; k++) putPoint(out, k, model.at(displayedCm[k]!));
		} else {
			const piece = displayedCm.slice(start, end);
			const xs = piece.map(Math.log);
			const wanted = new Map(xs.map((s, k) => [s, piece[k]!]));
			const lo = piece[0]!;
			const hi = piece[piece.length - 1]!;
			const points = new Map<number, PathPoint>();
			const exact = (s: number): Pair => {
				// A wanted depth exactly as asked (never nudged into the next layer by exp(ln d)).
				const p = model.at(wanted.get(s) ?? Math.min(hi, Math.max(lo, Math.exp(s))));
				points.set(s, p);
				return [p.attenuationDb, p.echoCenterMhz];
			};
			const values = {first: new Array<number>(xs.length), second: new Array<number>(xs.length)};
			smoothAlong(exact, xs, tolerance, values);
			const template = points.values().next().value!;
			xs.forEach((s, k) => {
				const d = piece[k]!;
				putPoint(
					out,
					start + k,
					points.get(s) ?? {
						...template,
						trueDepthCm: span.trueTopCm + (d - span.shownTopCm) / span.stretch,
						attenuationDb: values.first[k]!,
						echoCenterMhz: values.second[k]!,
					},
				);
			});
		}
		start = end;
	}
	return out;
}
