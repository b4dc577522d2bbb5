/**
 * Turns a validated plan document into the engine's plain input: tissue ids become full records,
 * a phantom calibration becomes a noise budget.
 */
import {noiseBudgetFromPhantom} from '../engine/noise-budget.js';
import type {EnginePlan} from '../engine/types.js';
import {defaultNoiseBudgetDb, parsePlanDocument, resolveTissue, type ParseResult, type PlanDocument} from './plan-schema.js';

export function resolvePlan(doc: PlanDocument): EnginePlan {
	const probe = {
		centerMhz: doc.probe.centerMhz,
		bandwidthFraction: doc.probe.bandwidthFraction,
		harmonic: doc.probe.harmonic,
	};
	const noiseBudgetDb = doc.phantomCalibration
		? noiseBudgetFromPhantom(doc.phantomCalibration, probe, doc.scattererExponent)
		: (doc.noiseBudgetDb ?? defaultNoiseBudgetDb);
	return {
		name: doc.name,
		region: doc.region,
		layers: doc.layers.map((l) => ({tissue: resolveTissue(l.tissue), thicknessCm: l.thicknessCm})),
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
	};
}

/** Validate and resolve in one step. */
export function parsePlan(input: unknown): ParseResult<{doc: PlanDocument; plan: EnginePlan}> {
	const r = parsePlanDocument(input);
	if (!r.ok) return r;
	return {ok: true, value: {doc: r.value, plan: resolvePlan(r.value)}};
}
