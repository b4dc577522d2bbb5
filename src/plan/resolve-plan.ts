/**
 * Turns a validated plan document into the engine's plain input: tissue ids become full records,
 * a phantom calibration becomes a noise budget.
 */
import {gaussianSteepness} from '../engine/echo-spectrum.js';
import {noiseBudgetFromPhantom} from '../engine/noise-budget.js';
import type {EnginePlan, Layer, ScannerResponse, Tissue} from '../engine/types.js';
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
				source:
					`α0 ${m.alphaDbPerCmMhz} (${m.lowDbPerCmMhz}–${m.highDbPerCmMhz}) dB/cm/MHz^n ` +
					`${measuredAlphaSource}; other values: ${base.source ?? 'custom'}`,
			}
		: base;
	const thicknessCm =
		l.thicknessAs === 'displayed' ? (l.thicknessCm * tissue.speedMps) / assumedSpeedMps : l.thicknessCm;
	return {tissue, thicknessCm};
}

/** What a plan takes from the scanner profile it names (looked up by the caller in the store). */
export interface PlanScanner {
	readonly response: ScannerResponse;
	/** Measured noise budget; null when the profile had no in-air image. */
	readonly noiseBudgetDb: number | null;
}

/**
 * With `scanner` (the profile the plan names), its measured depth response replaces the built-in
 * ramp, its noise budget replaces the typed or assumed one, and the sliders' range becomes ± the
 * measured full travel, so fitted values are reachable on that scanner.
 */
export function resolvePlan(doc: PlanDocument, scanner?: PlanScanner): EnginePlan {
	const probe = {
		centerMhz: doc.probe.centerMhz,
		bandwidthFraction: doc.probe.bandwidthFraction,
		spectrumSteepness: doc.probe.spectrumSteepness ?? gaussianSteepness,
		receive: doc.probe.receive ?? 'fundamental',
		angleDeg: doc.probe.angleDeg ?? 0,
	};
	const measuredBudget = scanner?.noiseBudgetDb ?? undefined;
	const noiseBudgetDb =
		measuredBudget !== undefined
			? measuredBudget
			: doc.phantomCalibration
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
		sliders: scanner?.response.sliderTravelDb
			? {
					...doc.sliders,
					minDb: -Math.abs(scanner.response.sliderTravelDb),
					maxDb: Math.abs(scanner.response.sliderTravelDb),
				}
			: doc.sliders,
		masterGain: {
			minDb: doc.masterGain.minDb,
			maxDb: doc.masterGain.maxDb,
			baseDb: doc.masterGain.baseDb ?? (doc.masterGain.minDb + doc.masterGain.maxDb) / 2,
		},
		noiseBudgetDb,
		noiseBudgetReceive,
		...(scanner ? {scanner: scanner.response} : {}),
	};
}

/** Validate and resolve in one step. */
export function parsePlan(input: unknown, scanner?: PlanScanner): ParseResult<{doc: PlanDocument; plan: EnginePlan}> {
	const r = parsePlanDocument(input);
	if (!r.ok) return r;
	return {ok: true, value: {doc: r.value, plan: resolvePlan(r.value, scanner)}};
}
