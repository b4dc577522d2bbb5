/**
 * Turns a validated plan document into the engine's plain input: tissue ids become full records,
 * a phantom calibration becomes a noise budget.
 */
import {gaussianSteepness} from '../engine/echo-spectrum.js';
import {noiseBudgetFromPhantom} from '../engine/noise-budget.js';
import type {EnginePlan, Layer, Tissue} from '../engine/types.js';
import {
	defaultNoiseBudgetDb,
	type LayerDocument,
	parsePlanDocument,
	resolveTissue,
	type ParseResult,
	type PlanDocument,
} from './plan-schema.js';

/** Source line of an α0 measured for this patient (the console and every output show it). */
export const measuredAlphaSource = 'measured for this patient';

/**
 * One layer for the engine: its tissue record (with a measured α0 and interval in place of the
 * library's, when given) and its true thickness. A thickness measured on screen is drawn c0/c times
 * the true one, so the true thickness is displayed × c/c0.
 */
export function resolveLayer(l: LayerDocument, assumedSpeedMps: number): Layer {
	const base = resolveTissue(l.tissue);
	const m = l.measuredAlpha;
	const tissue: Tissue = m
		? {
				...base,
				alphaDbPerCmMhz: m.alphaDbPerCmMhz,
				spread: {...base.spread, alphaDbPerCmMhz: [m.lowDbPerCmMhz, m.highDbPerCmMhz]},
				source: `α0 ${m.alphaDbPerCmMhz} (${m.lowDbPerCmMhz}–${m.highDbPerCmMhz}) dB/cm/MHz^n ${measuredAlphaSource}; other values: ${base.source ?? 'custom'}`,
			}
		: base;
	const thicknessCm = l.thicknessAs === 'displayed' ? (l.thicknessCm * tissue.speedMps) / assumedSpeedMps : l.thicknessCm;
	return {tissue, thicknessCm};
}

export function resolvePlan(doc: PlanDocument): EnginePlan {
	const probe = {
		centerMhz: doc.probe.centerMhz,
		bandwidthFraction: doc.probe.bandwidthFraction,
		spectrumSteepness: doc.probe.spectrumSteepness ?? gaussianSteepness,
		receive: doc.probe.receive ?? 'fundamental',
		angleDeg: doc.probe.angleDeg ?? 0,
	};
	const noiseBudgetDb = doc.phantomCalibration
		? noiseBudgetFromPhantom(doc.phantomCalibration, probe, doc.scattererExponent)
		: (doc.noiseBudgetDb ?? defaultNoiseBudgetDb);
	// The default budget is a fundamental figure; a stated one is for the mode it says (fundamental if it does not).
	const noiseBudgetReceive = doc.phantomCalibration
		? (doc.phantomCalibration.receive ?? 'fundamental')
		: doc.noiseBudgetDb !== undefined
			? (doc.noiseBudgetReceive ?? 'fundamental')
			: 'fundamental';
	return {
		name: doc.name,
		region: doc.region,
		layers: doc.layers.map((l) => resolveLayer(l, doc.display.assumedSpeedMps)),
		probe,
		scattererExponent: doc.scattererExponent,
		display: doc.display,
		sliders: doc.sliders,
		masterGain: {
			minDb: doc.masterGain.minDb,
			maxDb: doc.masterGain.maxDb,
			baseDb: doc.masterGain.baseDb ?? (doc.masterGain.minDb + doc.masterGain.maxDb) / 2,
		},
		noiseBudgetDb,
		noiseBudgetReceive,
	};
}

/** Validate and resolve in one step. */
export function parsePlan(input: unknown): ParseResult<{doc: PlanDocument; plan: EnginePlan}> {
	const r = parsePlanDocument(input);
	if (!r.ok) return r;
	return {ok: true, value: {doc: r.value, plan: resolvePlan(r.value)}};
}
