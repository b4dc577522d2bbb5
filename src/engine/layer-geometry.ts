/**
 * Where each layer sits, in true depth and in displayed depth.
 *
 * The scanner draws an echo at d = c0·t/2, with c0 the assumed speed (1540 m/s by convention) and
 * t = 2·Σ dᵢ/cᵢ the real round-trip time, so each layer is drawn c0/cᵢ times its true thickness:
 * slow fat looks thicker, fast tendon thinner. The compensation curve is indexed by displayed depth
 * because that is where the scanner's sliders sit.
 */
import type {Layer} from './types.js';

export interface LayerSpan {
	readonly index: number;
	readonly layer: Layer;
	readonly trueTopCm: number;
	/** Infinity for the last layer, which extends as far as needed. */
	readonly trueBottomCm: number;
	readonly shownTopCm: number;
	readonly shownBottomCm: number;
	/** Displayed cm per true cm in this layer (c0 / c). */
	readonly stretch: number;
}

export function layerSpans(layers: readonly Layer[], assumedSpeedMps: number): LayerSpan[] {
	const spans: LayerSpan[] = [];
	let trueTop = 0;
	let shownTop = 0;
	layers.forEach((layer, index) => {
		const isLast = index === layers.length - 1;
		const stretch = assumedSpeedMps / layer.tissue.speedMps;
		const thickness = isLast ? Number.POSITIVE_INFINITY : layer.thicknessCm;
		spans.push({
			index,
			layer,
			trueTopCm: trueTop,
			trueBottomCm: trueTop + thickness,
			shownTopCm: shownTop,
			shownBottomCm: shownTop + thickness * stretch,
			stretch,
		});
		trueTop += thickness;
		shownTop += thickness * stretch;
	});
	return spans;
}

/** The layer a displayed depth falls in (an exact boundary belongs to the shallower layer). */
export function spanAtDisplayed(spans: readonly LayerSpan[], displayedCm: number): LayerSpan {
	for (const span of spans) if (displayedCm <= span.shownBottomCm) return span;
	return spans[spans.length - 1]!;
}

/** True depth of a displayed depth, cm. */
export function trueDepthAt(span: LayerSpan, displayedCm: number): number {
	return span.trueTopCm + (displayedCm - span.shownTopCm) / span.stretch;
}

/** Displayed depth of a true depth, cm. */
export function displayedDepthOf(spans: readonly LayerSpan[], trueCm: number): number {
	for (const span of spans) {
		if (trueCm <= span.trueBottomCm) return span.shownTopCm + (trueCm - span.trueTopCm) * span.stretch;
	}
	return Number.NaN;
}

/** Round-trip echo time to a true depth, µs. */
export function echoTimeUs(spans: readonly LayerSpan[], trueCm: number, assumedSpeedMps: number): number {
	// Displayed depth is c0·t/2, so t = 2·d/c0 (cm and m/s: ×1e4 to µs).
	return ((2 * displayedDepthOf(spans, trueCm)) / assumedSpeedMps) * 1e4;
}
