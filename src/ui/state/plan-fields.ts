/**
 * Every editable field of a plan, in one registry: its label, unit, range (from the plan format's
 * `limits`), nudge steps, how to read it from a document and how to write it back. Pure.
 */
import {noiseBudgetFromPhantom} from '../../engine/noise-budget.js';
import {gaussianSteepness} from '../../engine/echo-spectrum.js';
import type {ReceiveMode} from '../../engine/types.js';
import {defaultNoiseBudgetDb, limits, type CustomTissue, type PlanDocument} from '../../plan/plan-schema.js';
import {setTargetLayer} from '../../plan/plan-target.js';
import {resolvePlan} from '../../plan/resolve-plan.js';
import {formatNumber, type NumberSpec} from './number-field.js';
import {fatLayerIndex} from '../../plan/fat-layer.js';
import {clonePlan, setFatThickness, setSliderCount, type Reference} from '../../plan/plan-edits.js';

export type NumberKey =
	| 'fat'
	| 'thickness'
	| 'speedMps'
	| 'densityKgM3'
	| 'alphaDbPerCmMhz'
	| 'exponent'
	| 'centerMhz'
	| 'bandwidthFraction'
	| 'spectrumSteepness'
	| 'angleDeg'
	| 'scattererExponent'
	| 'depthCm'
	| 'assumedSpeedMps'
	| 'sliderCount'
	| 'sliderMinDb'
	| 'sliderMaxDb'
	| 'rampDbPerCmMhz'
	| 'masterMinDb'
	| 'masterMaxDb'
	| 'masterBaseDb'
	| 'noiseBudgetDb'
	| 'phantomCenterMhz'
	| 'phantomDepthCm'
	| 'phantomAlpha'
	| 'refMasterDb'
	| 'refSliderDb'
	| 'targetLayer'
	| 'target'
	| 'measuredAlpha'
	| 'measuredLow'
	| 'measuredHigh';

export type ChoiceKey = 'harmonic' | 'knots' | 'ends' | 'noiseSource' | 'budgetReceive' | 'reference';

interface NumberField {
	readonly spec: NumberSpec;
	/** undefined: the field does not apply to this document (no such layer, no phantom). */
	get(doc: PlanDocument, index: number): number | undefined;
	set(doc: PlanDocument, index: number, value: number): PlanDocument;
	/** A refusal that depends on other fields (low below high); undefined when fine. */
	check?(doc: PlanDocument, index: number, value: number): string | undefined;
}

const spec = (
	label: string,
	unit: string,
	limit: NumberSpec['limit'],
	step: number,
	coarse: number,
	decimals: number,
	integer = false,
): NumberSpec => ({
	label,
	unit,
	limit,
	step,
	coarse,
	decimals,
	integer,
});

/** The phantom slope range of the plan format (it has no entry in `limits`). */
const phantomAlphaLimit = {min: 0.05, max: 2} as const;

function custom(doc: PlanDocument, index: number): CustomTissue | undefined {
	const t = doc.layers[index]?.tissue;
	return t !== undefined && typeof t !== 'string' ? t : undefined;
}

function customField(key: 'speedMps' | 'densityKgM3' | 'alphaDbPerCmMhz' | 'exponent', s: NumberSpec): NumberField {
	return {
		spec: s,
		get: (doc, i) => custom(doc, i)?.[key],
		set(doc, i, v) {
			const next = clonePlan(doc);
			const t = custom(next, i);
			if (t) t[key] = v;
			return next;
		},
	};
}

function edit(doc: PlanDocument, change: (d: PlanDocument) => void): PlanDocument {
	const next = clonePlan(doc);
	change(next);
	return next;
}

const db = (x: number) => `${formatNumber(x, {decimals: 1})} dB`;

export const numberFields: Record<NumberKey, NumberField> = {
	fat: {
		spec: spec('Fat, measured on screen', 'cm', limits.thicknessCm, 0.5, 2, 1),
		get: (doc) => doc.layers[fatLayerIndex(doc) ?? -1]?.thicknessCm,
		set: (doc, _i, v) => setFatThickness(doc, v),
	},
	thickness: {
		spec: spec('Thickness', 'cm', limits.thicknessCm, 0.1, 1, 2),
		get: (doc, i) => doc.layers[i]?.thicknessCm,
		set: (doc, i, v) => edit(doc, (d) => void (d.layers[i]!.thicknessCm = v)),
	},
	speedMps: customField('speedMps', spec('Speed c', 'm/s', limits.speedMps, 5, 50, 1)),
	densityKgM3: customField('densityKgM3', spec('Density rho', 'kg/m³', limits.densityKgM3, 10, 100, 1)),
	alphaDbPerCmMhz: customField(
		'alphaDbPerCmMhz',
		spec('Attenuation a0', 'dB/cm/MHz^n', limits.alphaDbPerCmMhz, 0.05, 0.5, 3),
	),
	exponent: customField('exponent', spec('Exponent n', '', limits.exponent, 0.05, 0.25, 2)),
	centerMhz: {
		spec: spec('Centre frequency', 'MHz', limits.centerMhz, 0.5, 2, 2),
		get: (doc) => doc.probe.centerMhz,
		set: (doc, _i, v) => edit(doc, (d) => void (d.probe.centerMhz = v)),
	},
	bandwidthFraction: {
		spec: spec('Bandwidth (x f0)', '', limits.bandwidthFraction, 0.05, 0.2, 2),
		get: (doc) => doc.probe.bandwidthFraction,
		set: (doc, _i, v) => edit(doc, (d) => void (d.probe.bandwidthFraction = v)),
	},
	// 2 is the Gaussian of older plans; real probes sit around 3–7 (README: which steepness to pick).
	spectrumSteepness: {
		spec: spec('Spectrum steepness p', '', limits.spectrumSteepness, 0.5, 2, 2),
		get: (doc) => doc.probe.spectrumSteepness ?? gaussianSteepness,
		set: (doc, _i, v) => edit(doc, (d) => void (d.probe.spectrumSteepness = v)),
	},
	angleDeg: {
		spec: spec('Beam angle from normal', '°', limits.angleDeg, 5, 15, 1),
		get: (doc) => doc.probe.angleDeg ?? 0,
		set: (doc, _i, v) => edit(doc, (d) => void (d.probe.angleDeg = v)),
	},
	scattererExponent: {
		spec: spec('Scatterer exponent m', '', limits.scattererExponent, 0.5, 1, 2),
		get: (doc) => doc.scattererExponent,
		set: (doc, _i, v) => edit(doc, (d) => void (d.scattererExponent = v)),
	},
	depthCm: {
		spec: spec('Display depth', 'cm', limits.depthCm, 0.5, 2, 1),
		get: (doc) => doc.display.depthCm,
		// A fixed target deeper than the new display comes up with it (a thin child on a shallow display).
		set: (doc, _i, v) =>
			edit(doc, (d) => {
				d.display.depthCm = v;
				if (d.targetDepthCm !== undefined && d.targetDepthCm > v) d.targetDepthCm = v;
			}),
	},
	measuredAlpha: {
		spec: spec('a0 measured (0 = none)', 'dB/cm/MHz^n', limits.alphaDbPerCmMhz, 0.05, 0.2, 3),
		get: (doc, i) => doc.layers[i]?.measuredAlpha?.alphaDbPerCmMhz,
		set: (doc, i, v) =>
			edit(doc, (d) => {
				const l = d.layers[i]!;
				if (v === 0) {
					delete l.measuredAlpha;
					return;
				}
				const m = l.measuredAlpha;
				// A new measurement starts with ±20 % (Madsen et al. 1986: laboratories agree to about 20 %).
				const low = m ? Math.min(m.lowDbPerCmMhz, v) : Math.round(v * 800) / 1000;
				const high = m ? Math.max(m.highDbPerCmMhz, v) : Math.round(v * 1200) / 1000;
				l.measuredAlpha = {alphaDbPerCmMhz: v, lowDbPerCmMhz: low, highDbPerCmMhz: high};
			}),
	},
	measuredLow: {
		spec: spec('  its interval, low', 'dB/cm/MHz^n', limits.alphaDbPerCmMhz, 0.05, 0.2, 3),
		get: (doc, i) => doc.layers[i]?.measuredAlpha?.lowDbPerCmMhz,
		set: (doc, i, v) => edit(doc, (d) => void (d.layers[i]!.measuredAlpha!.lowDbPerCmMhz = v)),
		check: (doc, i, v) =>
			v > (doc.layers[i]?.measuredAlpha?.alphaDbPerCmMhz ?? v) ? 'must not be above the measured value' : undefined,
	},
	measuredHigh: {
		spec: spec('  its interval, high', 'dB/cm/MHz^n', limits.alphaDbPerCmMhz, 0.05, 0.2, 3),
		get: (doc, i) => doc.layers[i]?.measuredAlpha?.highDbPerCmMhz,
		set: (doc, i, v) => edit(doc, (d) => void (d.layers[i]!.measuredAlpha!.highDbPerCmMhz = v)),
		check: (doc, i, v) =>
			v < (doc.layers[i]?.measuredAlpha?.alphaDbPerCmMhz ?? v) ? 'must not be below the measured value' : undefined,
	},
	targetLayer: {
		spec: spec('Target layer (0 = fixed)', '', {min: 0, max: limits.layers.max}, 1, 1, 0, true),
		get: (doc) => doc.targetBelowLayer?.layer ?? 0,
		set: (doc, _i, v) => setTargetLayer(doc, v, resolvePlan(doc)),
		check: (doc, _i, v) =>
			v > doc.layers.length ? `must be 0 (a fixed depth) or a layer from 1 to ${doc.layers.length}` : undefined,
	},
	target: {
		spec: spec('Target depth', 'cm', {min: 0, max: limits.depthCm.max}, 0.5, 2, 1),
		get: (doc) => doc.targetBelowLayer?.depthCm ?? doc.targetDepthCm ?? doc.display.depthCm,
		set: (doc, _i, v) =>
			edit(doc, (d) => {
				if (d.targetBelowLayer) d.targetBelowLayer.depthCm = v;
				else d.targetDepthCm = v;
			}),
		check: (doc, _i, v) =>
			!doc.targetBelowLayer && v > doc.display.depthCm
				? `must not be deeper than the display (${doc.display.depthCm} cm)`
				: undefined,
	},
	assumedSpeedMps: {
		spec: spec('Assumed speed', 'm/s', limits.assumedSpeedMps, 5, 20, 1),
		get: (doc) => doc.display.assumedSpeedMps,
		set: (doc, _i, v) => edit(doc, (d) => void (d.display.assumedSpeedMps = v)),
	},
	sliderCount: {
		spec: spec('Slider count', '', limits.sliderCount, 1, 4, 0, true),
		get: (doc) => doc.sliders.count,
		set: (doc, _i, v) => setSliderCount(doc, v),
	},
	sliderMinDb: {
		spec: spec('Slider low end', 'dB', limits.sliderDb, 1, 5, 1),
		get: (doc) => doc.sliders.minDb,
		set: (doc, _i, v) => edit(doc, (d) => void (d.sliders.minDb = v)),
		check: (doc, _i, v) =>
			v < doc.sliders.maxDb ? undefined : `must be below the slider high end (${db(doc.sliders.maxDb)})`,
	},
	sliderMaxDb: {
		spec: spec('Slider high end', 'dB', limits.sliderDb, 1, 5, 1),
		get: (doc) => doc.sliders.maxDb,
		set: (doc, _i, v) => edit(doc, (d) => void (d.sliders.maxDb = v)),
		check: (doc, _i, v) =>
			v > doc.sliders.minDb ? undefined : `must be above the slider low end (${db(doc.sliders.minDb)})`,
	},
	rampDbPerCmMhz: {
		spec: spec('Built-in ramp', 'dB/cm/MHz', limits.rampDbPerCmMhz, 0.05, 0.25, 2),
		get: (doc) => doc.sliders.rampDbPerCmMhz,
		set: (doc, _i, v) => edit(doc, (d) => void (d.sliders.rampDbPerCmMhz = v)),
	},
	masterMinDb: {
		spec: spec('Master low end', 'dB', limits.masterDb, 1, 5, 1),
		get: (doc) => doc.masterGain.minDb,
		set: (doc, _i, v) => edit(doc, (d) => void (d.masterGain.minDb = v)),
		check: (doc, _i, v) => {
			if (v >= doc.masterGain.maxDb) return `must be below the master high end (${db(doc.masterGain.maxDb)})`;
			const base = doc.masterGain.baseDb;
			return base !== undefined && v > base ? `must not be above the master skin level (${db(base)})` : undefined;
		},
	},
	masterMaxDb: {
		spec: spec('Master high end', 'dB', limits.masterDb, 1, 5, 1),
		get: (doc) => doc.masterGain.maxDb,
		set: (doc, _i, v) => edit(doc, (d) => void (d.masterGain.maxDb = v)),
		check: (doc, _i, v) => {
			if (v <= doc.masterGain.minDb) return `must be above the master low end (${db(doc.masterGain.minDb)})`;
			const base = doc.masterGain.baseDb;
			return base !== undefined && v < base ? `must not be below the master skin level (${db(base)})` : undefined;
		},
	},
	masterBaseDb: {
		// The master gain that shows the tissue under the skin right with sliders centred (default mid-range).
		spec: spec('Master skin level', 'dB', limits.masterDb, 1, 5, 1),
		get: (doc) => doc.masterGain.baseDb ?? (doc.masterGain.minDb + doc.masterGain.maxDb) / 2,
		set: (doc, _i, v) => edit(doc, (d) => void (d.masterGain.baseDb = v)),
		check: (doc, _i, v) =>
			v < doc.masterGain.minDb || v > doc.masterGain.maxDb
				? `must be within the master range, ${db(doc.masterGain.minDb)} to ${db(doc.masterGain.maxDb)}`
				: undefined,
	},
	noiseBudgetDb: {
		spec: spec('Noise budget', 'dB', limits.noiseBudgetDb, 1, 5, 1),
		get: (doc) => (doc.phantomCalibration ? undefined : (doc.noiseBudgetDb ?? defaultNoiseBudgetDb)),
		set: (doc, _i, v) => edit(doc, (d) => void (d.noiseBudgetDb = v)),
	},
	phantomCenterMhz: {
		spec: spec('Phantom frequency', 'MHz', limits.centerMhz, 0.5, 2, 2),
		get: (doc) => doc.phantomCalibration?.centerMhz,
		set: (doc, _i, v) => edit(doc, (d) => void (d.phantomCalibration!.centerMhz = v)),
	},
	phantomDepthCm: {
		spec: spec('Phantom reach', 'cm', limits.phantomDepthCm, 0.5, 2, 1),
		get: (doc) => doc.phantomCalibration?.depthCm,
		set: (doc, _i, v) => edit(doc, (d) => void (d.phantomCalibration!.depthCm = v)),
	},
	phantomAlpha: {
		spec: spec('Phantom slope', 'dB/cm/MHz', phantomAlphaLimit, 0.05, 0.2, 2),
		get: (doc) => doc.phantomCalibration?.alphaDbPerCmMhz,
		set: (doc, _i, v) => edit(doc, (d) => void (d.phantomCalibration!.alphaDbPerCmMhz = v)),
	},
	refMasterDb: {
		spec: {...spec('Usual master', 'dB', limits.masterDb, 1, 5, 1), isFixed: true},
		get: (doc) => doc.reference?.masterGainDb,
		set: (doc, _i, v) => edit(doc, (d) => void (d.reference!.masterGainDb = v)),
		check: (doc, _i, v) =>
			v < doc.masterGain.minDb || v > doc.masterGain.maxDb
				? `must be within the master range, ${db(doc.masterGain.minDb)} to ${db(doc.masterGain.maxDb)}`
				: undefined,
	},
	refSliderDb: {
		spec: {...spec('Usual slider', 'dB', limits.sliderDb, 1, 5, 1), isFixed: true},
		get: (doc, i) => doc.reference?.slidersDb[i],
		set: (doc, i, v) => edit(doc, (d) => void (d.reference!.slidersDb[i] = v)),
		check: (doc, _i, v) =>
			v < doc.sliders.minDb || v > doc.sliders.maxDb
				? `must be within the slider range, ${db(doc.sliders.minDb)} to ${db(doc.sliders.maxDb)}`
				: undefined,
	},
};

export interface ChoiceOption {
	readonly value: string;
	readonly text: string;
}

export interface ChoiceContext {
	/** The usual settings to start from when comparison is switched on. */
	readonly standardReference: () => Reference;
}

interface ChoiceField {
	readonly label: string;
	readonly options: readonly ChoiceOption[];
	get(doc: PlanDocument): string;
	set(doc: PlanDocument, value: string, ctx: ChoiceContext): PlanDocument;
}

export const choiceFields: Record<ChoiceKey, ChoiceField> = {
	harmonic: {
		label: 'Receive',
		options: [
			{value: 'fundamental', text: 'fundamental (at f0)'},
			{value: 'tissue-harmonic', text: 'tissue harmonic (at 2 f0)'},
			{value: 'scatterer-harmonic', text: 'scatterer harmonic (contrast)'},
		],
		get: (doc) => doc.probe.receive ?? 'fundamental',
		set: (doc, v) => edit(doc, (d) => void (d.probe.receive = v as NonNullable<typeof d.probe.receive>)),
	},
	knots: {
		// The plan file's own words first, so console, files, README and tables say the same thing.
		label: 'Slider knots',
		options: [
			{value: 'band-centres', text: 'band-centres (middle of each band)'},
			{value: 'band-edges', text: 'band-edges (skin to bottom)'},
		],
		get: (doc) => doc.sliders.knots,
		set: (doc, v) => edit(doc, (d) => void (d.sliders.knots = v as PlanDocument['sliders']['knots'])),
	},
	ends: {
		label: 'Slider ends',
		options: [
			{value: 'flat', text: 'flat (end values held)'},
			{value: 'extrapolate', text: 'extrapolate (slope carried on)'},
		],
		get: (doc) => doc.sliders.ends,
		set: (doc, v) => edit(doc, (d) => void (d.sliders.ends = v as PlanDocument['sliders']['ends'])),
	},
	noiseSource: {
		label: 'Noise budget from',
		options: [
			{value: 'budget', text: 'a typed value'},
			{value: 'phantom', text: 'a phantom reach'},
		],
		get: (doc) => (doc.phantomCalibration ? 'phantom' : 'budget'),
		set: (doc, v) =>
			edit(doc, (d) => {
				if (v === 'phantom' && !d.phantomCalibration) {
					d.phantomCalibration = {centerMhz: d.probe.centerMhz, depthCm: 16, alphaDbPerCmMhz: 0.5};
					delete d.noiseBudgetDb;
					delete d.noiseBudgetReceive;
				} else if (v === 'budget' && d.phantomCalibration) {
					// Keep the budget the calibration gave, so switching does not move the curve.
					d.noiseBudgetDb = Math.round(derivedNoiseBudgetDb(d) * 10) / 10;
					if (d.phantomCalibration.receive) d.noiseBudgetReceive = d.phantomCalibration.receive;
					delete d.phantomCalibration;
				}
			}),
	},
	// The mode the phantom reach was measured in (or the typed budget stated for): a fundamental
	// reach does not give the harmonic budget.
	budgetReceive: {
		label: 'Budget measured in',
		options: [
			{value: 'fundamental', text: 'fundamental'},
			{value: 'tissue-harmonic', text: 'tissue harmonic'},
			{value: 'scatterer-harmonic', text: 'scatterer harmonic'},
		],
		get: (doc) => budgetReceiveOf(doc),
		set: (doc, v) =>
			edit(doc, (d) => {
				const mode = v as ReceiveMode;
				if (d.phantomCalibration) d.phantomCalibration.receive = mode;
				else {
					d.noiseBudgetDb = d.noiseBudgetDb ?? defaultNoiseBudgetDb;
					d.noiseBudgetReceive = mode;
				}
			}),
	},
	reference: {
		label: 'Compare to usual',
		options: [
			{value: 'off', text: 'no'},
			{value: 'on', text: 'yes'},
		],
		get: (doc) => (doc.reference ? 'on' : 'off'),
		set: (doc, v, ctx) =>
			edit(doc, (d) => {
				if (v === 'on' && !d.reference) d.reference = ctx.standardReference();
				if (v === 'off') delete d.reference;
			}),
	},
};

/** The receive mode the plan's noise budget is for (the default budget is a fundamental figure). */
export function budgetReceiveOf(doc: PlanDocument): ReceiveMode {
	if (doc.phantomCalibration) return doc.phantomCalibration.receive ?? 'fundamental';
	return doc.noiseBudgetDb !== undefined ? (doc.noiseBudgetReceive ?? 'fundamental') : 'fundamental';
}

/** The budget the engine will use (typed, default, or from the phantom), dB. */
export function derivedNoiseBudgetDb(doc: PlanDocument): number {
	if (!doc.phantomCalibration) return doc.noiseBudgetDb ?? defaultNoiseBudgetDb;
	return noiseBudgetFromPhantom(doc.phantomCalibration, doc.probe, doc.scattererExponent);
}

/** The next option after the current one (wrapping), or the one before. */
export function cycleChoice(field: ChoiceField, current: string, direction: 1 | -1): string {
	const i = field.options.findIndex((o) => o.value === current);
	const n = field.options.length;
	return field.options[((((i < 0 ? 0 : i) + direction) % n) + n) % n]!.value;
}
