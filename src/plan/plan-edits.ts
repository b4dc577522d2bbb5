/**
 * Whole-plan edits the console makes, pure: each returns a new document and leaves the old one
 * alone (the reducer keeps the old one when the schema refuses the new).
 */
import {computeCurve} from '../engine/compensation-curve.js';
import {libraryTissue} from '../engine/tissue-library.js';
import {fatLayerIndex} from './fat-layer.js';
import type {CustomTissue, LayerDocument, PlanDocument} from './plan-schema.js';
import {resolvePlan} from './resolve-plan.js';
import {roundTo} from './rounding.js';

export type Reference = NonNullable<PlanDocument['reference']>;

/**
 * A deep copy. A plan is plain JSON data (numbers, strings, booleans, arrays, objects), so a plain
 * walk does what structuredClone did at a fraction of its cost (it ran on every key press).
 */
export function clonePlan(doc: PlanDocument): PlanDocument {
	return copyPlain(doc) as PlanDocument;
}

function copyPlain(value: unknown): unknown {
	if (Array.isArray(value)) return value.map(copyPlain);
	if (value === null || typeof value !== 'object') return value;
	const copy: Record<string, unknown> = {};
	for (const [key, v] of Object.entries(value)) copy[key] = copyPlain(v);
	return copy;
}

/** Where a missing fat layer goes: below any skin or custom pad layers at the top. */
function fatInsertIndex(doc: PlanDocument): number {
	let i = 0;
	while (i < doc.layers.length - 1 && (doc.layers[i]!.tissue === 'skin' || typeof doc.layers[i]!.tissue !== 'string'))
		i++;
	return i;
}

export function setFatThickness(doc: PlanDocument, cm: number): PlanDocument {
	const next = clonePlan(doc);
	const i = fatLayerIndex(next);
	// The fat row takes what the sonographer measured on the screen (a displayed thickness).
	if (i !== null) Object.assign(next.layers[i]!, {thicknessCm: cm, thicknessAs: 'displayed'});
	else next.layers.splice(fatInsertIndex(next), 0, {tissue: 'fat', thicknessCm: cm, thicknessAs: 'displayed'});
	return next;
}

/** A new layer of generic soft tissue, 1 cm, just below `index`. */
export function addLayer(doc: PlanDocument, index: number): PlanDocument {
	const next = clonePlan(doc);
	next.layers.splice(Math.min(index + 1, next.layers.length), 0, {
		tissue: 'soft-tissue',
		thicknessCm: 1,
		thicknessAs: 'displayed',
	});
	return next;
}

export function removeLayer(doc: PlanDocument, index: number): PlanDocument {
	const next = clonePlan(doc);
	next.layers.splice(index, 1);
	return next;
}

/** Swaps layer `index` with its neighbour above (-1) or below (+1); unchanged at the ends. */
export function moveLayer(doc: PlanDocument, index: number, delta: -1 | 1): PlanDocument {
	const j = index + delta;
	if (j < 0 || j >= doc.layers.length) return doc;
	const next = clonePlan(doc);
	const a = next.layers[index]!;
	next.layers[index] = next.layers[j]!;
	next.layers[j] = a;
	return next;
}

export function setLayerTissue(doc: PlanDocument, index: number, tissue: LayerDocument['tissue']): PlanDocument {
	const next = clonePlan(doc);
	next.layers[index]!.tissue = tissue;
	return next;
}

/** The layer's tissue as editable custom values (a library tissue is copied, its source kept). */
export function customCopy(tissue: LayerDocument['tissue']): CustomTissue {
	if (typeof tissue !== 'string') return {...tissue};
	const t = libraryTissue(tissue);
	if (!t) return {label: 'custom tissue', speedMps: 1540, densityKgM3: 1000, alphaDbPerCmMhz: 0.5, exponent: 1};
	const copy: CustomTissue = {
		label: `${t.label} (own values)`.slice(0, 60),
		speedMps: t.speedMps,
		densityKgM3: t.densityKgM3,
		alphaDbPerCmMhz: t.alphaDbPerCmMhz,
		exponent: t.exponent,
	};
	if (t.source) copy.source = `started from the library: ${t.source}`.slice(0, 300);
	return copy;
}

/** Resamples a reference's sliders to a new count, by position along the display (shallow to deep). */
export function resizeReference(ref: Reference, count: number): Reference {
	const old = ref.slidersDb;
	if (old.length === count) return ref;
	const at = (x: number) => {
		if (old.length === 1) return old[0]!;
		const pos = x * (old.length - 1);
		const k = Math.min(old.length - 2, Math.floor(pos));
		const t = pos - k;
		return old[k]! * (1 - t) + old[k + 1]! * t;
	};
	const slidersDb = Array.from({length: count}, (_, k) => roundTo(at(count === 1 ? 0.5 : k / (count - 1)), 1));
	return {masterGainDb: ref.masterGainDb, slidersDb};
}

export function setSliderCount(doc: PlanDocument, count: number): PlanDocument {
	const next = clonePlan(doc);
	next.sliders.count = count;
	if (next.reference) next.reference = resizeReference(next.reference, count);
	return next;
}

/**
 * The department's usual settings taken as the starting plan's standard layers scanned with this
 * plan's probe and system (same sliders, depth and ranges), so the deltas compare like with like.
 */
export function standardReference(doc: PlanDocument, standardLayers: PlanDocument['layers']): Reference {
	const probe = clonePlan(doc);
	probe.layers = structuredClone(standardLayers);
	delete probe.reference;
	const fit = computeCurve(resolvePlan(probe), {band: false}).fit;
	return {masterGainDb: roundTo(fit.masterGainDb, 1), slidersDb: fit.sliders.map((s) => roundTo(s.gainDb, 1))};
}
