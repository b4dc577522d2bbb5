/**
 * The depth the exam must reach (the frequency ladder's target). A plan gives it as an absolute
 * displayed depth (`targetDepthCm`), or as displayed cm below the displayed top of a layer
 * (`targetBelowLayer`), which follows the organ when the layers above it change (a thicker fat layer
 * pushes the far side of the liver deeper); without either it is the display depth.
 */
import {layerSpans} from '../engine/layer-geometry.js';
import type {EnginePlan} from '../engine/types.js';
import type {PlanDocument} from './plan-schema.js';

/** Displayed depth of the target, cm (may lie below the display when it follows a layer). */
export function targetDepthOf(doc: PlanDocument, plan: EnginePlan): number {
	const rel = doc.targetBelowLayer;
	if (rel) {
		const spans = layerSpans(plan.layers, plan.display.assumedSpeedMps);
		const span = spans[Math.min(rel.layer, spans.length) - 1]!;
		return span.shownTopCm + rel.depthCm;
	}
	return doc.targetDepthCm ?? doc.display.depthCm;
}

function plain(x: number): string {
	return String(Math.round(x * 100) / 100);
}

/** "15 cm", "10 cm below the top of layer 4 (Liver)", "the display depth (16 cm)". */
export function describeTarget(doc: PlanDocument, layerLabel?: (index: number) => string): string {
	const rel = doc.targetBelowLayer;
	if (rel) {
		const label = layerLabel?.(rel.layer - 1);
		return `${plain(rel.depthCm)} cm below the top of layer ${rel.layer}${label ? ` (${label})` : ''}`;
	}
	if (doc.targetDepthCm !== undefined) return `${plain(doc.targetDepthCm)} cm`;
	return `the display depth (${plain(doc.display.depthCm)} cm)`;
}

/**
 * The same target, given another way: 0 makes it a fixed depth (where it is now, within the
 * display); K makes it follow layer K, keeping its present depth as far as it lies below that
 * layer's top. Pure; returns a new document.
 */
export function setTargetLayer(doc: PlanDocument, layer: number, plan: EnginePlan): PlanDocument {
	const now = targetDepthOf(doc, plan);
	const {targetDepthCm: _fixed, targetBelowLayer: _follow, ...rest} = doc;
	if (layer <= 0) return {...rest, targetDepthCm: Math.min(now, doc.display.depthCm)};
	const spans = layerSpans(plan.layers, plan.display.assumedSpeedMps);
	const top = spans[Math.min(layer, spans.length) - 1]!.shownTopCm;
	return {...rest, targetBelowLayer: {layer, depthCm: Math.max(0, Math.round((now - top) * 100) / 100)}};
}
