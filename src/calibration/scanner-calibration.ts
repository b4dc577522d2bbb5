/**
 * From a handful of phantom stills to the scanner's own terms: grey map, depth response, slider
 * travel, noise floor and penetration (methods: shared reference §2 and §4; sources in the files
 * this one calls). Pure: the images arrive decoded.
 */
import {basisWeights, knotDepths} from '../engine/slider-basis.js';
import {cellsForHalfWidth} from '../speckle/speckle-statistics.js';
import {bandMeans, measuredColumns, speckleCellArea, usableGrey, type ImageBands} from './band-statistics.js';
import {CalibrationRefusal} from './calibration-refusal.js';
import {evaluateMap, fitGreyMap, greyAtLevel, type GreyMapFit, type StepObservation} from './grey-map-fit.js';
import {phantomLossDb, type PhantomMaterial, type ProbeSpectrum} from './phantom-loss.js';
import type {PhantomImage} from './phantom-image.js';

/** Fewest independent speckle cells for a band to be reported: ±1 dB at 95 % for one image
 * (N = (1.96·5.57/1)² = 119; Kaplan & Ma 1994 for the 5.57 dB, shared reference case C33). */
export const minCellsPerBand = Math.floor(cellsForHalfWidth(1));
/** Fewest gain steps (three points fix an offset and a slope and check the map's shape). */
export const minGainSteps = 3;
/** Echo-to-noise down to which the depth response is reported, dB (at least the 6 dB the issue asks). */
export const depthResponseFloorEnrDb = 3;
/** A gain-step image whose measured pixels are less grey than this is refused. */
const minGreyFraction = 0.5;
/** Rubert & Zagzebski 2015: penetration where the phantom's pixel value is 1.4 × the in-air value. */
export const pixelRatioCriterion = 1.4;

export interface CalibrationImage {
	/** As written in the session, for messages. */
	readonly name: string;
	/** Session path of the entry, e.g. `gainSteps.2`. */
	readonly field: string;
	readonly image: PhantomImage;
	readonly masterGainDb: number;
}

export interface SliderStepImage extends CalibrationImage {
	/** 1 = nearest the skin. */
	readonly slider: number;
	/** −1…1 of the slider's travel (1 = full travel up). */
	readonly position: number;
}

/** What the session states about the scanner, probe and phantom; the calibration carries it on. */
export interface CalibrationSetting {
	readonly label: string;
	readonly probe: ProbeSpectrum;
	readonly displayDepthCm: number;
	readonly phantom: PhantomMaterial;
	readonly columns: readonly [number, number];
	readonly sliderCount: number;
}

export interface CalibrationInput extends CalibrationSetting {
	readonly gainSteps: readonly CalibrationImage[];
	readonly probeInAir?: CalibrationImage;
	readonly sliderSteps?: readonly SliderStepImage[];
}

export interface BandReport {
	readonly depthCm: number;
	/** Independent speckle cells in this band of one image. */
	readonly cells: number;
	/** Band level at 0 dB master gain, dB (echo and noise together). */
	readonly levelDb: number;
	/** SD of that level from speckle, dB. */
	readonly sdDb: number;
	/** Echo-to-noise, dB, when an in-air image was given. */
	readonly echoToNoiseDb: number | null;
}

export interface SliderStepReport {
	readonly slider: number;
	readonly position: number;
	readonly knotDepthCm: number;
	/** dB that full travel adds at the slider's knot. */
	readonly travelDb: number;
	/** Depth span where the step added at least half its peak, cm. */
	readonly influenceWidthCm: number;
}

export interface ScannerCalibration extends CalibrationSetting {
	/** Level shown at each grey, dB on the master-gain scale (a band at 0 dB level shows grey g at master gain h(g)). */
	readonly greyMap: ReadonlyArray<{readonly grey: number; readonly levelDb: number}>;
	/** The scanner's own depth gain with sliders centred, relative to its shallowest point, dB. */
	readonly depthResponse: ReadonlyArray<{readonly depthCm: number; readonly gainDb: number}>;
	readonly sliderTravelDb: number | null;
	readonly sliderSteps: readonly SliderStepReport[];
	/** Noise as displayed at the in-air image's master gain, on the grey map's level scale, dB. */
	readonly noiseFloor: ReadonlyArray<{readonly depthCm: number; readonly levelDb: number}> | null;
	/** Displayed depth where the phantom's echo power equals the noise power (echo-to-noise 0 dB). */
	readonly penetrationCm: number | null;
	/** Round-trip loss in the phantom at penetrationCm with this probe: the engine's noise budget. */
	readonly noiseBudgetDb: number | null;
	/** Penetration by the pixel-ratio criterion of Rubert & Zagzebski 2015, with its echo-to-noise in dB. */
	readonly pixelRatioPenetration: {
		readonly criterion: string;
		readonly depthCm: number;
		readonly echoToNoiseDb: number | null;
	} | null;
	readonly bands: readonly BandReport[];
	readonly rmsResidualDb: number;
	readonly cellAreaPx: number;
	readonly notes: readonly string[];
}

function refuseMostlyColour(step: CalibrationImage, bands: ImageBands): void {
	if (1 - bands.maskedFraction < minGreyFraction) {
		throw new CalibrationRefusal(
			`${step.field}.image`,
			`${step.name}: only ${((1 - bands.maskedFraction) * 100).toFixed(0)} % of the measured ` +
				'pixels are grey; colour images (flow, elastography) cannot be calibrated — export the ' +
				'grey B-mode image',
		);
	}
}

/** Smooths over about 1 cm: weights ¼ ½ ¼ on 0.5 cm bands, renormalised at the ends. */
function smooth3(values: readonly number[]): number[] {
	return values.map((v, i) => {
		let s = 0.5 * v;
		let w = 0.5;
		for (const j of [i - 1, i + 1]) {
			const u = values[j];
			if (u !== undefined) {
				s += 0.25 * u;
				w += 0.25;
			}
		}
		return s / w;
	});
}

/** Depth where a sampled series first falls to `level`, linearly interpolated; null if it never does. */
function firstCrossing(depths: readonly number[], values: readonly number[], level: number): number | null {
	for (let i = 0; i < values.length; i++) {
		if (values[i]! <= level) {
			if (i === 0) return depths[0]!;
			const t = (values[i - 1]! - level) / (values[i - 1]! - values[i]!);
			return depths[i - 1]! + t * (depths[i]! - depths[i - 1]!);
		}
	}
	return null;
}

const powerDb = (db: number) => 10 ** (db / 10);

export function calibrateScanner(input: CalibrationInput): ScannerCalibration {
	if (input.gainSteps.length < minGainSteps) {
		throw new CalibrationRefusal(
			'gainSteps',
			`has ${input.gainSteps.length} image${input.gainSteps.length === 1 ? '' : 's'}; at least ` +
				`${minGainSteps} of the same phantom with only the master gain changed are needed`,
		);
	}
	const notes: string[] = [];
	const depth = input.displayDepthCm;
	// One speckle cell area for the series, measured on the middle gain step (same probe and settings).
	const byGain = [...input.gainSteps].sort((a, b) => a.masterGainDb - b.masterGainDb);
	const middle = byGain[Math.floor(byGain.length / 2)]!;
	const cellAreaPx = speckleCellArea(middle.image, measuredColumns(middle.image, input.columns));
	const cellsByBand = new Map<number, number>();
	const observations: StepObservation[] = [];
	let thinBands = 0;
	input.gainSteps.forEach((step, k) => {
		const bands = bandMeans(step.image, input.columns, depth, cellAreaPx);
		refuseMostlyColour(step, bands);
		for (const b of bands.bands) {
			cellsByBand.set(b.band, Math.max(cellsByBand.get(b.band) ?? 0, b.cells));
			if (b.cells < minCellsPerBand) {
				thinBands++;
				continue;
			}
			if (b.meanGrey < usableGrey.low || b.meanGrey > usableGrey.high) continue;
			observations.push({image: k, band: b.band, meanGrey: b.meanGrey, sdMeanGrey: b.sdMeanGrey});
		}
	});
	if (thinBands)
		notes.push(`bands with fewer than ${minCellsPerBand} speckle cells were left out (${thinBands} band images)`);
	const fit = fitGreyMap(
		observations,
		input.gainSteps.map((s) => s.masterGainDb),
	);
	const level = (grey: number) => evaluateMap(fit.knots, fit.levelDb, grey);
	const bandIds = [...fit.bandLevelDb.keys()].sort((a, b) => a - b);
	if (bandIds.length < 3)
		throw new CalibrationRefusal(
			'gainSteps',
			'fewer than 3 depth bands have a usable grey level in any image; check the gain steps and the depth scale',
		);
	const depthOf = (band: number) => (band + 0.5) * 0.5;

	// Noise floor from the probe-in-air image, on the same level scale.
	let noiseByBand: Map<number, number> | null = null;
	let noiseFloor: ScannerCalibration['noiseFloor'] = null;
	if (input.probeInAir) {
		const air = input.probeInAir;
		const bands = bandMeans(air.image, input.columns, depth, cellAreaPx);
		refuseMostlyColour(air, bands);
		const lo = fit.knots[0]!;
		const hi = fit.knots[fit.knots.length - 1]!;
		noiseByBand = new Map();
		const floor: Array<{depthCm: number; levelDb: number}> = [];
		for (const b of bands.bands) {
			if (b.meanGrey < Math.max(lo, usableGrey.low) || b.meanGrey > hi) continue;
			const shown = level(b.meanGrey);
			noiseByBand.set(b.band, shown - air.masterGainDb);
			floor.push({depthCm: b.depthCm, levelDb: shown});
		}
		if (floor.length) noiseFloor = floor;
		else
			notes.push(
				`the in-air image's greys lie outside the calibrated grey map (${lo.toFixed(0)}–${hi.toFixed(0)}); ` +
					'raise its master gain to measure the noise floor',
			);
	}

	// Band levels, echo-only where the noise is known, and echo-to-noise.
	const bands: BandReport[] = bandIds.map((band) => {
		const e = fit.bandLevelDb.get(band)!;
		const n = noiseByBand?.get(band);
		const enr =
			n === undefined ? null : powerDb(e - n) > 1 ? 10 * Math.log10(powerDb(e - n) - 1) : Number.NEGATIVE_INFINITY;
		return {
			depthCm: depthOf(band),
			cells: cellsByBand.get(band) ?? 0,
			levelDb: e,
			sdDb: fit.bandSdDb.get(band) ?? Number.NaN,
			echoToNoiseDb: enr,
		};
	});

	// Depth response R = P + L_ph over the bands with enough echo, smoothed over ~1 cm.
	const responseBands = bands.filter((b) => b.echoToNoiseDb === null || b.echoToNoiseDb >= depthResponseFloorEnrDb);
	const contiguous: BandReport[] = [];
	for (const b of responseBands) {
		const previous = contiguous[contiguous.length - 1];
		if (previous && b.depthCm - previous.depthCm > 1.01) break; // a gap over 1 cm: stop rather than bridge
		contiguous.push(b);
	}
	if (contiguous.length < 3)
		throw new CalibrationRefusal(
			'gainSteps',
			'fewer than 3 contiguous depth bands carry echo above the noise; check the images and the depth scale',
		);
	const rawResponse = contiguous.map((b) => {
		const n = noiseByBand?.get(Math.round(b.depthCm / 0.5 - 0.5));
		const echo = n === undefined ? b.levelDb : 10 * Math.log10(powerDb(b.levelDb) - powerDb(n));
		return echo + phantomLossDb(input.phantom, input.probe, b.depthCm);
	});
	const smoothed = smooth3(rawResponse);
	const zero = smoothed[0]!;
	const depthResponse = contiguous.map((b, i) => ({depthCm: b.depthCm, gainDb: smoothed[i]! - zero}));
	if (contiguous[0]!.depthCm > 1)
		notes.push(
			`the shallowest usable band is at ${contiguous[0]!.depthCm} cm (deeper than 1 cm): the near field was clipped or masked`,
		);

	// Penetration: echo-to-noise 0 dB, i.e. (echo + noise) − noise = 3.01 dB.
	let penetrationCm: number | null = null;
	let pixelRatioPenetration: ScannerCalibration['pixelRatioPenetration'] = null;
	if (noiseByBand?.size) {
		const withNoise = bands.filter((b) => noiseByBand!.has(Math.round(b.depthCm / 0.5 - 0.5)));
		const depths = withNoise.map((b) => b.depthCm);
		const excess = smooth3(withNoise.map((b) => b.levelDb - noiseByBand!.get(Math.round(b.depthCm / 0.5 - 0.5))!));
		penetrationCm = firstCrossing(depths, excess, 10 * Math.log10(2));
		if (penetrationCm === null)
			notes.push(
				`the phantom's echo stays above the noise to the deepest measured band (${depths[depths.length - 1]} cm): penetration is beyond it`,
			);
		// Rubert & Zagzebski 2015: phantom grey at the in-air image's gain against 1.4 × the in-air grey.
		const gAir = input.probeInAir!.masterGainDb;
		const ratio = withNoise.map((b) => {
			const phantomGrey = greyAtLevel(fit.knots, fit.levelDb, b.levelDb + gAir);
			const airGrey = greyAtLevel(fit.knots, fit.levelDb, noiseByBand!.get(Math.round(b.depthCm / 0.5 - 0.5))! + gAir);
			return phantomGrey / Math.max(1e-6, airGrey);
		});
		const at = firstCrossing(depths, smooth3(ratio), pixelRatioCriterion);
		if (at !== null) {
			const i = depths.findIndex((d) => d >= at);
			const enr = withNoise[Math.max(0, i)]?.echoToNoiseDb ?? null;
			pixelRatioPenetration = {
				criterion: 'phantom grey = 1.4 × in-air grey (Rubert & Zagzebski 2015)',
				depthCm: at,
				echoToNoiseDb: enr !== null && Number.isFinite(enr) ? enr : null,
			};
		}
	}
	const noiseBudgetDb = penetrationCm === null ? null : phantomLossDb(input.phantom, input.probe, penetrationCm);

	// Slider travel: the level change a moved slider makes, fitted to its interpolation basis.
	const knots = knotDepths(
		{count: input.sliderCount, knots: 'band-centres', ends: 'flat', minDb: -1, maxDb: 1, rampDbPerCmMhz: 0},
		depth,
	);
	const sliderSteps: SliderStepReport[] = (input.sliderSteps ?? []).map((step) => {
		if (step.slider > input.sliderCount)
			throw new CalibrationRefusal(
				`${step.field}.slider`,
				`is ${step.slider}; the session has sliders.count ${input.sliderCount}`,
			);
		const measured = bandMeans(step.image, input.columns, depth, cellAreaPx);
		refuseMostlyColour(step, measured);
		const lo = fit.knots[0]!;
		const hi = fit.knots[fit.knots.length - 1]!;
		const deltas: Array<{depthCm: number; delta: number; weight: number}> = [];
		for (const b of measured.bands) {
			const e = fit.bandLevelDb.get(b.band);
			if (e === undefined || b.meanGrey < lo || b.meanGrey > hi || b.cells < minCellsPerBand) continue;
			if (b.meanGrey < usableGrey.low || b.meanGrey > usableGrey.high) continue;
			const w = basisWeights(knots, 'flat', b.depthCm)[step.slider - 1]!;
			deltas.push({depthCm: b.depthCm, delta: level(b.meanGrey) - step.masterGainDb - e, weight: w});
		}
		const sw2 = deltas.reduce((s, d) => s + d.weight * d.weight, 0);
		if (sw2 < 0.5)
			throw new CalibrationRefusal(
				`${step.field}.image`,
				`${step.name}: too few usable bands around slider ${step.slider} to measure its travel`,
			);
		const amplitude = deltas.reduce((s, d) => s + d.weight * d.delta, 0) / sw2;
		const peak = Math.max(...smooth3(deltas.map((d) => d.delta)).map((v) => v * Math.sign(amplitude)));
		const above = deltas.filter((_, i) => smooth3(deltas.map((d) => d.delta))[i]! * Math.sign(amplitude) >= peak / 2);
		const width = above.length ? above[above.length - 1]!.depthCm - above[0]!.depthCm + 0.5 : 0;
		return {
			slider: step.slider,
			position: step.position,
			knotDepthCm: knots[step.slider - 1]!,
			travelDb: amplitude / step.position,
			influenceWidthCm: width,
		};
	});
	const sliderTravelDb = sliderSteps.length
		? sliderSteps.reduce((s, r) => s + r.travelDb, 0) / sliderSteps.length
		: null;

	notes.push(
		`rows are read as vertical depth; only ${Math.round(input.columns[0] * 100)}–${Math.round(input.columns[1] * 100)} ` +
			`% of the region's width is measured, where depth and range along the beam agree for ` +
			'sector and curved images',
	);
	const lo = Math.ceil(fit.knots[0]!);
	const hi = Math.floor(fit.knots[fit.knots.length - 1]!);
	const greyMap: Array<{grey: number; levelDb: number}> = [];
	for (let g = lo; g <= hi; g += g + 5 > hi && g < hi ? hi - g : 5) {
		greyMap.push({grey: g, levelDb: level(g)});
		if (g === hi) break;
	}
	return {
		label: input.label,
		probe: input.probe,
		displayDepthCm: depth,
		phantom: input.phantom,
		columns: input.columns,
		sliderCount: input.sliderCount,
		greyMap,
		depthResponse,
		sliderTravelDb,
		sliderSteps,
		noiseFloor,
		penetrationCm,
		noiseBudgetDb,
		pixelRatioPenetration,
		bands,
		rmsResidualDb: fit.rmsResidualDb,
		cellAreaPx,
		notes,
	};
}

export type {GreyMapFit};
