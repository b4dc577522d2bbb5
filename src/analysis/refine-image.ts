/**
 * Refine a plan from one still image of the patient taken with known settings: measure the echo
 * level per depth band in speckle from tissue, compare it with what the plan expects under those
 * settings, estimate the patient's own attenuation for one layer, and refit the sliders and master
 * to the refined plan with the engine's own fitter (same bounds, same split rule).
 *
 * Corrections follow the published route (shared method notes §3.6): the layer's attenuation
 * changes, the plan's compensation is recomputed and refitted. They therefore undo propagation loss
 * only; a tissue that is simply brighter or darker than the plan's reference keeps that contrast,
 * as the engine's curve does. What the model cannot explain is reported per band, not
 * folded into the sliders.
 */
import {computeCurve, pathModelOf, scannerProfileNote} from '../engine/compensation-curve.js';
import type {CurveResult, EnginePlan} from '../engine/types.js';
import {
	assumedRamp,
	bandSampleDepths,
	deliveredGainDb,
	meanOver,
	settingsOfFit,
	type AppliedSettings,
	type OwnDepthGain,
} from './applied-gain.js';
import {fitLayerAttenuation, withLayerAlpha, type AttenuationEstimate, type FitBand} from './attenuation-fit.js';
import {bandRows, measureBands, type BandMeasurement} from './band-levels.js';
import {windowStatistics} from '../speckle/correlation-area.js';
import {regionBottomCm, type GreyFrame, type MeasuredRegion} from './grey-frame.js';
import {imageNoiseLevel, type ImageNoise} from './image-noise.js';
import {logLevelMap, type LevelMap} from './level-map.js';
import {maskNonSpeckle, type SpeckleMask} from './speckle-mask.js';

/** A band is usable with a 95 % half-width of at most this (dB) … */
export const usableHalfWidthDb = 1;
/** … and at least this echo-to-noise (dB). */
export const usableEchoToNoiseDb = 6;
/** Mean grey below this is taken as black (no tissue echo shown; ~8 % of the grey range). */
export const darkGrey = 20;
/** Uncalibrated: a band with more clipped-black pixels than this loses its mean. */
const clippedLimit = 0.05;
/** The fit is declined when its SD exceeds this, dB/cm/MHz (shared method notes §3.6). */
export const largestAlphaSd = 0.1;
/** Fewer usable bands than this in the whole image: no tissue to measure. */
export const fewestTissueBands = 3;
/** Fewest usable bands, and least depth (cm) they must span, inside the fitted layer. */
export const fewestFitBands = 3;
export const leastFitSpanCm = 2;
/** Leftover after the model beyond this (dB) says the plan differs from the patient in more than α. */
const leftoverWarningDb = 2;
/** Image depth may differ from the plan's display depth by this fraction before it is refused. */
export const depthTolerance = 0.05;

export interface RefineRequest {
	readonly frame: GreyFrame;
	readonly region: MeasuredRegion;
	readonly plan: EnginePlan;
	/** Settings the image was taken with; default: the plan's own fitted sliders and master. */
	readonly applied?: AppliedSettings;
	/** Layer whose attenuation is fitted (0-based); default: the deepest layer the image shows. */
	readonly layerIndex?: number;
	/** Grey → dB; default: plain log with `dynamicRangeDb`. */
	readonly levelMap?: LevelMap;
	/** The scanner's own depth gain; default: the plan's assumed ramp. */
	readonly ownGain?: OwnDepthGain;
	/** dB that one slider's full travel adds (a scanner profile's slider travel), to state changes in travel. */
	readonly sliderTravelDb?: number | null;
	/** Dynamic range assumed without a profile, dB. @default 60 */
	readonly dynamicRangeDb?: number;
	/** Called as each stage ends (the benchmark's split); nothing else depends on it. */
	readonly onStage?: (stage: RefineStage) => void;
}

/** Stages of a refinement: band levels measured (mask included), α0 fitted, sliders refitted (and the rest). */
export type RefineStage = 'bands' | 'attenuation' | 'sliders';

export type BandVerdict =
	| 'usable'
	| 'too-few-cells'
	| 'dark'
	| 'clipped'
	| 'below-noise'
	| 'off-map'
	| 'beyond-profile';

export interface RefinedBand extends BandMeasurement {
	/** Level the plan expects under the applied settings, with the image's offset added, dB. */
	readonly expectedDb: number;
	/** Measured − expected, dB (NaN when not measured). */
	readonly residualDb: number;
	readonly echoToNoiseDb: number;
	readonly verdict: BandVerdict;
	readonly usable: boolean;
	/** Tissue echo level (noise power removed) after the corrections are applied, dB (NaN when not measured). */
	readonly correctedDb: number;
	/** Layer (0-based) the band's centre falls in. */
	readonly layerIndex: number;
	/** Used in the attenuation fit. */
	readonly fitted: boolean;
}

export interface RefineWarning {
	readonly code:
		| 'uncalibrated'
		| 'cannot-tell'
		| 'unusable-bands'
		| 'model-leftover'
		| 'slider-range-exceeded'
		| 'settings-stated'
		| 'scanner-profile';
	readonly message: string;
}

export interface AttenuationResult extends AttenuationEstimate {
	readonly layerIndex: number;
	readonly label: string;
	readonly planAlphaDbPerCmMhz: number;
	readonly bandsUsed: number;
}

/** What an error in the assumptions of uncalibrated mode can do to α0 (dB/cm/MHz). */
export interface UncalibratedCost {
	readonly dynamicRangeDb: number;
	/** α0 if the true dynamic range were 10 dB smaller / larger. */
	readonly alphaAtRange: readonly [number, number] | null;
	/** α0 if the scanner's own ramp were 0.1 dB/cm/MHz lower / higher than assumed. */
	readonly alphaAtRamp: readonly [number, number] | null;
	/** The plan's noise budget, and the one the image's own level course shows (null when it shows no noise), dB. */
	readonly planNoiseBudgetDb: number;
	readonly imageNoiseBudgetDb: number | null;
	/** α0 had the plan's noise budget been trusted, when the image shows more noise than it allows. */
	readonly alphaAtPlanBudget: number | null;
}

/** Without a profile, α0 is not reported when the image's noise sits this far (dB) above the plan's budget. */
export const noiseBudgetDisagreementDb = 6;

export interface RefineResult {
	readonly ok: true;
	readonly bands: readonly RefinedBand[];
	readonly mask: SpeckleMask;
	readonly cellAreaPx: number;
	readonly levelMap: LevelMap;
	readonly applied: AppliedSettings;
	readonly appliedIsPlanFit: boolean;
	/** Offset of the image's level scale against the plan's, dB (from the shallowest tissue bands). */
	readonly offsetDb: number;
	readonly attenuation: AttenuationResult | null;
	/** Why no attenuation was reported, when it was not. */
	readonly cannotTell: string | null;
	/** The plan with the measured attenuation, and its curve (sliders and master to set). */
	readonly refinedPlan: EnginePlan;
	readonly refinedCurve: CurveResult;
	readonly sliders: readonly RefinedSlider[];
	readonly masterGainDb: number;
	readonly masterCorrectionDb: number;
	readonly uncalibrated: UncalibratedCost | null;
	readonly warnings: readonly RefineWarning[];
}

export interface RefinedSlider {
	readonly depthCm: number;
	/** The slider to set, dB. */
	readonly gainDb: number;
	/** Change from the settings the image was taken with, dB. */
	readonly correctionDb: number;
	/** The change as a fraction of the slider's full travel, with a profile; null without. */
	readonly correctionTravel: number | null;
}

export type RefineOutcome = RefineResult | {readonly ok: false; readonly problem: string};

/** Checks that the image and plan describe the same display; null when fine. */
export function depthMismatch(plan: EnginePlan, region: MeasuredRegion): string | null {
	const bottom = regionBottomCm(region);
	const want = plan.display.depthCm;
	if (Math.abs(bottom - want) > depthTolerance * want + region.cmPerPixel) {
		return (
			`the image shows ${bottom.toFixed(1)} cm of depth but the plan's display depth is ${want} cm (they must agree ` +
			`within ${depthTolerance * 100} %): use a plan made for this image's depth, or check the depth scale`
		);
	}
	return null;
}

/** The deepest layer whose displayed top lies in the image. */
function deepestShownLayer(plan: EnginePlan, bottomCm: number): number {
	const spans = pathModelOf(plan).spans;
	let k = 0;
	for (const s of spans) if (s.shownTopCm < bottomCm) k = s.index;
	return k;
}

interface Evaluated {
	bands: RefinedBandDraft[];
	offsetDb: number;
}

interface RefinedBandDraft {
	m: BandMeasurement;
	samples: number[];
	delivered: number;
	expectedRaw: number;
	layerIndex: number;
	verdict: BandVerdict;
	echoToNoiseDb: number;
	residualDb: number;
	/** Predicted noise level in the band, on the image's scale, dB. */
	noiseDb: number;
}

function median(v: number[]): number {
	const s = [...v].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** Residuals, echo-to-noise and verdicts of measured bands under one set of assumptions. */
function evaluate(
	plan: EnginePlan,
	applied: AppliedSettings,
	own: OwnDepthGain,
	map: LevelMap,
	measured: readonly BandMeasurement[],
	levelOf: (m: BandMeasurement) => number,
	/** Noise relative to the delivered gain on the image's scale, dB, when judged from the image. */
	imageNoiseDb: number | null = null,
): Evaluated {
	const model = pathModelOf(plan);
	const spans = model.spans;
	const profileEndCm = plan.scanner ? (plan.scanner.depthsCm[plan.scanner.depthsCm.length - 1] ?? null) : null;
	const drafts: RefinedBandDraft[] = measured.map((m) => {
		const samples = bandSampleDepths(m.topCm, m.bottomCm);
		const delivered = meanOver(samples, (d) => deliveredGainDb(plan, applied, own, d));
		const loss = meanOver(samples, (d) => model.lossAt(d));
		const span = spans.find((s) => m.depthCm <= s.shownBottomCm) ?? spans[spans.length - 1]!;
		let verdict: BandVerdict = 'usable';
		if (!(m.cells > 0)) verdict = 'too-few-cells';
		// A profile's depth response stops where its phantom echo met the noise; deeper, the scanner's gain is unknown.
		else if (profileEndCm !== null && m.depthCm > profileEndCm) verdict = 'beyond-profile';
		else if (m.meanGrey < Math.max(darkGrey, map.greyRange[0])) verdict = 'dark';
		else if (m.meanGrey > map.greyRange[1]) verdict = 'off-map';
		else if (!map.calibrated && m.clippedFraction > clippedLimit) verdict = 'clipped';
		return {
			m,
			samples,
			delivered,
			expectedRaw: delivered - loss,
			layerIndex: span.index,
			verdict,
			echoToNoiseDb: Number.NaN,
			noiseDb: Number.NaN,
			residualDb: m.cells > 0 ? levelOf(m) - (delivered - loss) : Number.NaN,
		};
	});
	// The image's offset: the shallowest measured bands are taken as tissue at the plan's reference.
	const shallow = drafts
		.filter((d) => d.verdict === 'usable')
		.slice(0, 3)
		.map((d) => d.residualDb);
	const offsetDb = shallow.length ? median(shallow) : 0;
	for (const d of drafts) {
		d.noiseDb = d.delivered + Math.max(offsetDb - plan.noiseBudgetDb, imageNoiseDb ?? Number.NEGATIVE_INFINITY);
		if (d.verdict !== 'usable') continue;
		const excess = 10 ** ((levelOf(d.m) - d.noiseDb) / 10) - 1;
		d.echoToNoiseDb = excess > 0 ? 10 * Math.log10(excess) : Number.NEGATIVE_INFINITY;
		if (d.echoToNoiseDb < usableEchoToNoiseDb) d.verdict = 'below-noise';
		else if (d.m.halfWidthDb > usableHalfWidthDb) d.verdict = 'too-few-cells';
	}
	return {bands: drafts, offsetDb};
}

/** The image's own noise level from the bands of the fitted layer and below that show speckle. */
function noiseFromImage(ev: Evaluated, plan: EnginePlan, layerIndex: number): ImageNoise | null {
	const span = pathModelOf(plan).spans[layerIndex]!;
	const bands = ev.bands
		.filter((d) => (d.verdict === 'usable' || d.verdict === 'below-noise') && d.m.topCm >= span.shownTopCm - 1e-6)
		.map((d) => ({sampleDepthsCm: d.samples, residualDb: d.residualDb, sdDb: d.m.sdDb}));
	return imageNoiseLevel(plan, layerIndex, bands);
}

/** The tissue echo's level with the noise power taken out (the level itself when it does not exceed the noise). */
function tissueLevelDb(levelDb: number, noiseDb: number): number {
	const excess = 10 ** (levelDb / 10) - 10 ** (noiseDb / 10);
	return excess > 0 ? 10 * Math.log10(excess) : levelDb;
}

/** Fit bands of one layer: noise power removed, its SD grown to match. */
function fitBandsOf(
	ev: Evaluated,
	plan: EnginePlan,
	layerIndex: number,
	levelOf: (m: BandMeasurement) => number,
): {bands: FitBand[]; drafts: RefinedBandDraft[]} {
	const spans = pathModelOf(plan).spans;
	const span = spans[layerIndex]!;
	const drafts = ev.bands.filter(
		(d) => d.verdict === 'usable' && d.m.topCm >= span.shownTopCm - 1e-6 && d.m.bottomCm <= span.shownBottomCm + 1e-6,
	);
	const bands = drafts.map((d) => {
		const signal = tissueLevelDb(levelOf(d.m), d.noiseDb);
		const grow = 1 + 10 ** (-d.echoToNoiseDb / 10);
		return {sampleDepthsCm: d.samples, residualDb: signal - d.expectedRaw, sdDb: d.m.sdDb * grow};
	});
	return {bands, drafts};
}

interface LayerFit {
	estimate: AttenuationEstimate | null;
	cannotTell: string | null;
	fitted: Set<RefinedBandDraft>;
}

function fitLayer(
	ev: Evaluated,
	plan: EnginePlan,
	layerIndex: number,
	levelOf: (m: BandMeasurement) => number,
): LayerFit {
	const spans = pathModelOf(plan).spans;
	const span = spans[layerIndex]!;
	const label = span.layer.tissue.label;
	const barrier = pathModelOf(plan).barrier;
	const none = (cannotTell: string): LayerFit => ({estimate: null, cannotTell, fitted: new Set()});
	if (barrier && barrier.displayedCm <= span.shownTopCm + 1e-9) {
		return none(
			`layer ${layerIndex + 1} (${label}) lies beyond a ${barrier.kind.replace('strong-', '')} at ` +
				`${barrier.displayedCm.toFixed(1)} cm: no echo to measure`,
		);
	}
	const usable = ev.bands.filter((d) => d.verdict === 'usable');
	const deepest = usable.length ? usable[usable.length - 1]!.m.bottomCm : 0;
	if (deepest <= span.shownTopCm + 1e-9) {
		return none(
			`the usable image stops at ${deepest.toFixed(1)} cm, above layer ${layerIndex + 1} (${label}) from ` +
				`${span.shownTopCm.toFixed(1)} cm: too shallow to tell`,
		);
	}
	const {bands, drafts} = fitBandsOf(ev, plan, layerIndex, levelOf);
	const spanCm = drafts.length ? drafts[drafts.length - 1]!.m.bottomCm - drafts[0]!.m.topCm : 0;
	if (drafts.length < fewestFitBands || spanCm < leastFitSpanCm) {
		return none(
			`layer ${layerIndex + 1} (${label}) has ${drafts.length} usable band(s) over ${spanCm.toFixed(1)} cm; at least ` +
				`${fewestFitBands} over ${leastFitSpanCm} cm are needed (layer too thin, or too few speckle cells above the noise)`,
		);
	}
	const estimate = fitLayerAttenuation(plan, layerIndex, bands);
	if (estimate.sd > largestAlphaSd) {
		return none(
			`the image cannot tell layer ${layerIndex + 1} (${label}): α0 ${estimate.alphaDbPerCmMhz.toFixed(2)} ± ` +
				`${(1.96 * estimate.sd).toFixed(2)} dB/cm/MHz is too uncertain (SD above ${largestAlphaSd})`,
		);
	}
	return {estimate, cannotTell: null, fitted: new Set(drafts)};
}

export function refineImage(req: RefineRequest): RefineOutcome {
	const {frame, region, plan} = req;
	const dynamicRangeDb = req.dynamicRangeDb ?? 60;
	const map = req.levelMap ?? logLevelMap(dynamicRangeDb);
	const own = req.ownGain ?? assumedRamp;
	let planCurve: CurveResult | undefined;
	const planFit = () => (planCurve ??= computeCurve(plan, {band: false}));
	const applied = req.applied ?? settingsOfFit(planFit().fit);

	const mismatch = depthMismatch(plan, region);
	if (mismatch) return {ok: false, problem: mismatch};

	// Speckle cell size (median over a few bands spread over the depth, so depth trends and structures do not inflate it)
	// sets the mask's block size.
	const valid = frame.valid ?? new Uint8Array(frame.width * frame.height).fill(1);
	const allBands = bandRows(region);
	const sampled = allBands.filter((_, i) => i % Math.max(1, Math.ceil(allBands.length / 5)) === 0);
	const areas = sampled.map(
		(b) =>
			windowStatistics({grey: frame.grey, use: valid, width: frame.width, rows: b.rows, columns: region.columns})
				.cellAreaPx,
	);
	const cellAreaPx = areas.length ? median(areas) : 1;
	const mask = maskNonSpeckle(frame, region, map, cellAreaPx);
	const measured = measureBands(frame, region, mask, map);
	const levelOf = (m: BandMeasurement) => m.levelDb;
	const bottom = regionBottomCm(region);
	const layerIndex = req.layerIndex ?? deepestShownLayer(plan, bottom);
	let ev = evaluate(plan, applied, own, map, measured, levelOf);
	// Without a profile the plan's noise budget is an assumption the scanner may not meet: judge the
	// noise from the image's own level course in the fitted layer, and keep the higher of the two.
	const noise = map.calibrated ? null : noiseFromImage(ev, plan, layerIndex);
	if (noise?.seen) ev = evaluate(plan, applied, own, map, measured, levelOf, noise.noiseDb);
	req.onStage?.('bands');
	const usableBands = ev.bands.filter((d) => d.verdict === 'usable');
	if (usableBands.length < fewestTissueBands) {
		return {
			ok: false,
			problem:
				`no tissue: ${usableBands.length} of ${ev.bands.length} depth bands show enough speckle from tissue above ` +
				`the noise (at least ${fewestTissueBands} are needed; the rest are anechoic, black, masked or noise)`,
		};
	}
	// Noise follows the applied gain; tissue echoes fall with the plan's loss. Levels that rise
	// one for one with the loss the plan expects are noise, not tissue.
	{
		const model = pathModelOf(plan);
		const xs = usableBands.map((d) => meanOver(d.samples, (z) => model.lossAt(z)));
		const ys = usableBands.map((d) => d.residualDb);
		const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
		const my = ys.reduce((a, b) => a + b, 0) / ys.length;
		let sxy = 0;
		let sxx = 0;
		for (let i = 0; i < xs.length; i++) {
			sxy += (xs[i]! - mx) * (ys[i]! - my);
			sxx += (xs[i]! - mx) ** 2;
		}
		if (sxx > 100 && sxy / sxx > 0.7) {
			return {
				ok: false,
				problem:
					'no tissue: the measured levels follow the applied gain the way noise does, not the fall-off of tissue echoes (all anechoic or noise)',
			};
		}
	}

	let lf = fitLayer(ev, plan, layerIndex, levelOf);
	const span = pathModelOf(plan).spans[layerIndex]!;
	const imageNoiseDb = noise?.seen ? noise.noiseDb : null;
	let uncalibrated: UncalibratedCost | null = null;
	if (!map.calibrated) {
		const cost = uncalibratedCost(
			req,
			layerIndex,
			applied,
			own,
			measured,
			dynamicRangeDb,
			lf.estimate?.alphaDbPerCmMhz ?? null,
			imageNoiseDb,
		);
		uncalibrated = {
			...cost,
			planNoiseBudgetDb: plan.noiseBudgetDb,
			imageNoiseBudgetDb: imageNoiseDb === null ? null : ev.offsetDb - imageNoiseDb,
			alphaAtPlanBudget:
				imageNoiseDb === null || !lf.estimate ? null : alphaAtPlanBudget(plan, applied, own, map, measured, layerIndex),
		};
		// Noise and tissue are told apart by how their levels follow the delivered gain, which without a
		// profile is the assumed ramp. When the image's noise sits far above the plan's budget it covers
		// much of the layer, and a ramp error tilts those bands like a change of α0: then say so, not a number.
		const est = lf.estimate;
		const short = uncalibrated.imageNoiseBudgetDb === null ? 0 : plan.noiseBudgetDb - uncalibrated.imageNoiseBudgetDb;
		if (est && short > noiseBudgetDisagreementDb) {
			const trusted =
				uncalibrated.alphaAtPlanBudget === null
					? ''
					: `, ${uncalibrated.alphaAtPlanBudget.toFixed(2)} trusting the plan's noise budget`;
			lf = {
				estimate: null,
				fitted: new Set(),
				cannotTell:
					`without a scanner profile the image cannot tell layer ${layerIndex + 1} (${span.layer.tissue.label}): ` +
					`its noise shows at ${uncalibrated.imageNoiseBudgetDb!.toFixed(0)} dB of loss, ${short.toFixed(0)} dB short of ` +
					`the plan's ${plan.noiseBudgetDb.toFixed(0)} dB budget, so deep bands are noise and telling them from tissue ` +
					`rests on the assumed ramp (α0 would read ${est.alphaDbPerCmMhz.toFixed(2)} dB/cm/MHz leaving them ` +
					`out${trusted}); calibrate the scanner to measure it`,
			};
		}
	}
	// Without a profile the 95 % interval from the speckle statistics is widened to hold what the
	// assumptions (range ±10 dB, ramp ±0.1 dB/cm/MHz) alone would read: calibration uncertainty.
	const widened =
		lf.estimate && uncalibrated
			? widen(lf.estimate, [uncalibrated.alphaAtRange, uncalibrated.alphaAtRamp])
			: lf.estimate;
	const attenuation: AttenuationResult | null = widened
		? {
				...widened,
				layerIndex,
				label: span.layer.tissue.label,
				planAlphaDbPerCmMhz: span.layer.tissue.alphaDbPerCmMhz,
				bandsUsed: lf.fitted.size,
			}
		: null;

	req.onStage?.('attenuation');
	const refinedPlan = attenuation ? withLayerAlpha(plan, layerIndex, attenuation.alphaDbPerCmMhz) : plan;
	const refinedCurve = attenuation ? computeCurve(refinedPlan, {band: false}) : planFit();
	const refinedSettings = settingsOfFit(refinedCurve.fit);
	const travel = req.sliderTravelDb && req.sliderTravelDb > 0 ? req.sliderTravelDb : null;
	const sliders: RefinedSlider[] = refinedCurve.fit.sliders.map((s, k) => {
		const correctionDb = s.gainDb - (applied.slidersDb[k] ?? 0);
		return {
			depthCm: s.depthCm,
			gainDb: s.gainDb,
			correctionDb,
			correctionTravel: travel ? correctionDb / travel : null,
		};
	});

	const bands: RefinedBand[] = ev.bands.map((d) => {
		const change = meanOver(
			d.samples,
			(z) => deliveredGainDb(plan, refinedSettings, own, z) - deliveredGainDb(plan, applied, own, z),
		);
		const level = Number.isFinite(d.m.levelDb) ? tissueLevelDb(d.m.levelDb, d.noiseDb) : Number.NaN;
		return {
			...d.m,
			expectedDb: d.expectedRaw + ev.offsetDb,
			residualDb: d.residualDb,
			echoToNoiseDb: d.echoToNoiseDb,
			verdict: d.verdict,
			usable: d.verdict === 'usable',
			correctedDb: Number.isFinite(level) ? level + change : Number.NaN,
			layerIndex: d.layerIndex,
			fitted: lf.fitted.has(d),
		};
	});

	const warnings: RefineWarning[] = [];
	warnings.push({
		code: 'settings-stated',
		message: req.applied
			? 'Corrections are changes from the stated settings; if the image was taken with other settings, the corrections are wrong.'
			: "No settings given: the image is assumed to be taken with the plan's own sliders and master. If it was not, the " +
				'corrections are wrong (give them with --applied).',
	});
	if (plan.scanner) warnings.push({code: 'scanner-profile', message: scannerProfileNote(plan)});
	if (lf.cannotTell)
		warnings.push({
			code: 'cannot-tell',
			message: `Attenuation not measured: ${lf.cannotTell}. The sliders shown are the plan's own fit.`,
		});
	const unusable = bands.filter((b) => !b.usable);
	if (unusable.length) {
		const list = unusable.map((b) => `${b.depthCm.toFixed(1)} cm ${b.verdict}`).join(', ');
		warnings.push({code: 'unusable-bands', message: `${unusable.length} of ${bands.length} bands unusable (${list}).`});
	}
	if (attenuation) {
		const worst = attenuation.leftoverDb.reduce((a, b) => Math.max(a, Math.abs(b)), 0);
		if (worst > leftoverWarningDb) {
			warnings.push({
				code: 'model-leftover',
				message:
					`The measured levels in layer ${layerIndex + 1} differ from the fitted model by up to ${worst.toFixed(1)} ` +
					`dB: the patient differs from the plan in more than this layer's attenuation (thicknesses, tissues, or the stated settings).`,
			});
		}
	}
	if (refinedCurve.fit.residualDb > 2) {
		warnings.push({
			code: 'slider-range-exceeded',
			message:
				`Sliders and master gain cannot follow the refined curve: they miss it by up to ` +
				`${refinedCurve.fit.residualDb.toFixed(1)} dB at ${refinedCurve.fit.residualAtCm.toFixed(1)} cm.`,
		});
	}

	if (uncalibrated) {
		const fmt = (r: readonly [number, number] | null) =>
			r ? `${r[0].toFixed(2)}–${r[1].toFixed(2)}` : 'not measurable';
		warnings.unshift({
			code: 'uncalibrated',
			message:
				`Uncalibrated: no scanner profile, so grey is read as a plain ${dynamicRangeDb} dB logarithmic display, ` +
				`the scanner's own depth gain as the assumed ramp (${plan.sliders.rampDbPerCmMhz} dB/cm/MHz) and its noise ` +
				`${noiseSource(uncalibrated)}. Their errors go straight into the result: α0 would read ` +
				`${fmt(uncalibrated.alphaAtRange)} dB/cm/MHz if the true range were ${dynamicRangeDb - 10}–${dynamicRangeDb + 10} ` +
				`dB, and ${fmt(uncalibrated.alphaAtRamp)} if the ramp were off by ±0.1 dB/cm/MHz; ${noiseCost(uncalibrated)}; a ` +
				'focal zone or processing curve adds its own dB per slider.' +
				(attenuation ? ' The α0 interval is widened to hold the range and ramp readings.' : '') +
				' Calibrate the scanner for measured corrections.',
		});
	}

	req.onStage?.('sliders');
	return {
		ok: true,
		bands,
		mask,
		cellAreaPx,
		levelMap: map,
		applied,
		appliedIsPlanFit: req.applied === undefined,
		offsetDb: ev.offsetDb,
		attenuation,
		cannotTell: lf.cannotTell,
		refinedPlan,
		refinedCurve,
		sliders,
		masterGainDb: refinedSettings.masterGainDb,
		masterCorrectionDb: refinedSettings.masterGainDb - applied.masterGainDb,
		uncalibrated,
		warnings,
	};
}

/** The estimate with its interval stretched over the assumption-shifted readings. */
function widen(est: AttenuationEstimate, pairs: readonly (readonly [number, number] | null)[]): AttenuationEstimate {
	let low = est.low;
	let high = est.high;
	for (const p of pairs) {
		if (!p) continue;
		low = Math.min(low, Math.max(0, p[0]));
		high = Math.max(high, p[1]);
	}
	return {...est, low, high};
}

function noiseSource(u: UncalibratedCost): string {
	return u.imageNoiseBudgetDb === null
		? `as the plan's budget (${u.planNoiseBudgetDb.toFixed(0)} dB), which the image does not contradict`
		: `as the image's own level course shows it (at ${u.imageNoiseBudgetDb.toFixed(0)} dB of loss; the plan budgets ` +
				`${u.planNoiseBudgetDb.toFixed(0)} dB)`;
}

function noiseCost(u: UncalibratedCost): string {
	if (u.imageNoiseBudgetDb === null) {
		return "if the scanner's noise is higher than the budget, deep noise can pass as tissue and α0 reads low";
	}
	const trusted =
		u.alphaAtPlanBudget === null
			? ''
			: ` (trusting the plan's budget, α0 would read ${u.alphaAtPlanBudget.toFixed(2)})`;
	return (
		`bands where the image's level follows the gain the way noise does are left out${trusted}, but without a ` +
		`probe-in-air image the noise level is itself an estimate`
	);
}

/** α0 with the plan's stated noise budget, as if the image's noise had not been judged. */
function alphaAtPlanBudget(
	plan: EnginePlan,
	applied: AppliedSettings,
	own: OwnDepthGain,
	map: LevelMap,
	measured: readonly BandMeasurement[],
	layerIndex: number,
): number | null {
	const levelOf = (m: BandMeasurement) => m.levelDb;
	const ev = evaluate(plan, applied, own, map, measured, levelOf);
	const {bands} = fitBandsOf(ev, plan, layerIndex, levelOf);
	return bands.length >= fewestFitBands ? fitLayerAttenuation(plan, layerIndex, bands).alphaDbPerCmMhz : null;
}

/** Re-runs the fit with the dynamic range ±10 dB and the ramp ±0.1 dB/cm/MHz. */
function uncalibratedCost(
	req: RefineRequest,
	layerIndex: number,
	applied: AppliedSettings,
	own: OwnDepthGain,
	measured: readonly BandMeasurement[],
	dynamicRangeDb: number,
	measuredAlpha: number | null,
	imageNoiseDb: number | null,
): Pick<UncalibratedCost, 'dynamicRangeDb' | 'alphaAtRange' | 'alphaAtRamp'> {
	if (measuredAlpha === null) return {dynamicRangeDb, alphaAtRange: null, alphaAtRamp: null};
	const {plan} = req;
	const alphaWith = (range: number, rampShift: number): number => {
		const map = logLevelMap(range);
		const levelOf = (m: BandMeasurement) => map.levelDb(m.meanGrey);
		const shifted: OwnDepthGain = (p, d) =>
			own(p, d) +
			rampShift * ((plan.probe.receive ?? 'fundamental') !== 'fundamental' ? 3 : 2) * plan.probe.centerMhz * d;
		const scaled = measured.map((m) => ({...m, sdDb: (m.sdDb * range) / dynamicRangeDb}));
		// The image's noise scales with the range like every level read through the map.
		const ev = evaluate(
			plan,
			applied,
			shifted,
			map,
			scaled,
			levelOf,
			imageNoiseDb === null ? null : (imageNoiseDb * range) / dynamicRangeDb,
		);
		const {bands} = fitBandsOf(ev, plan, layerIndex, levelOf);
		return bands.length >= fewestFitBands
			? fitLayerAttenuation(plan, layerIndex, bands, measuredAlpha).alphaDbPerCmMhz
			: Number.NaN;
	};
	const pair = (a: number, b: number): readonly [number, number] | null =>
		Number.isFinite(a) && Number.isFinite(b) ? [Math.min(a, b), Math.max(a, b)] : null;
	return {
		dynamicRangeDb,
		alphaAtRange: pair(alphaWith(dynamicRangeDb - 10, 0), alphaWith(dynamicRangeDb + 10, 0)),
		alphaAtRamp: pair(alphaWith(dynamicRangeDb, -0.1), alphaWith(dynamicRangeDb, 0.1)),
	};
}
