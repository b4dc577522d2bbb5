/**
 * Invented demo images with their truth, made by the realistic scanner:
 * - a phantom series: a uniform reference phantom at five master-gain steps, the probe in air, and
 *   one slider at full travel, with a ready session file for `evenecho scanner calibrate`
 *   (format evenecho-scanner-session/1) and the truth used to make them;
 * - a patient image: the plan's stack with the deepest layer's attenuation changed, taken at the
 *   plan's own fitted settings, with those settings and the truth.
 * The phantom is clamped (the same speckle in every phantom image); thermal noise is new in each.
 * Pure: the caller writes the files.
 */
import {computeCurve, pathModelOf} from '../engine/compensation-curve.js';
import type {EnginePlan} from '../engine/types.js';
import {colourOverlayNote, greyToRgb} from './colour-overlay.js';
import type {RowsToDepth} from './echo-rows.js';
import {settingsOfFit, type AppliedSettings} from './row-gains.js';
import {phantomPlan, realisticConstants, realisticScanner, type ScannerBehaviour} from './scanner-behaviour.js';
import {frameMargins, type ImageRegion} from './scanner-frame.js';
import {demoStructures} from './patient-structures.js';
import {noiseLevelDb, phantomPenetrationCm, scannerTruth} from './scanner-truth.js';
import {simulateFrame, speckleFor} from './simulate-frame.js';

/** Whole picture size of every demo image, px (the 600×480 of the scanner-profile benchmark). */
export const demoPictureSize = {width: 600, height: 480} as const;

export type ImageRole = 'gain-step' | 'probe-in-air' | 'slider-step' | 'patient';

export interface DemoImage {
	/** File name without extension. */
	readonly name: string;
	readonly role: ImageRole;
	readonly width: number;
	readonly height: number;
	readonly channels: 1 | 3;
	readonly data: Uint8Array;
	readonly masterGainDb: number;
	readonly slider?: number;
	readonly position?: number;
}

export interface DemoSet {
	readonly images: readonly DemoImage[];
	readonly region: ImageRegion;
	readonly cmPerPixel: number;
	readonly rowsToDepth: RowsToDepth;
	/** The scanner session file (phantom series only), image names with `extension`. */
	readonly session: Record<string, unknown> | null;
	/** Applied settings file (patient only): {sliders: [dB…], masterGainDb}. */
	readonly appliedSettings: {sliders: number[]; masterGainDb: number} | null;
	readonly truth: Record<string, unknown>;
}

/** Master-gain steps of the phantom series on the scanner's displayed scale, dB. */
export const phantomGainStepsDb = [18, 24, 30, 36, 42] as const;

const round = (v: number, digits = 4) => Number(v.toFixed(digits));

function caption(scanner: ScannerBehaviour, plan: EnginePlan, masterGainDb: number, what: string): string {
	return (
		`${what}  G ${masterGainDb} DB  ${plan.probe.centerMhz} MHZ  ${plan.display.depthCm} CM ` +
		` ${scanner.kind === 'realistic' ? 'SIM' : ''}`
	);
}

/** The phantom series for a plan's probe, display depth and slider count. */
export function phantomSeries(
	plan: EnginePlan,
	seed: number,
	extension: string,
	label = 'Simulated scanner (invented), reference phantom',
	size: {readonly width: number; readonly height: number} = demoPictureSize,
): DemoSet {
	const regionWidth = size.width - frameMargins.left - frameMargins.right;
	const regionHeight = size.height - frameMargins.top - frameMargins.bottom;
	const phantom = phantomPlan(plan);
	const scanner = realisticScanner(plan);
	const clamped = speckleFor(phantom, regionWidth, regionHeight, seed);
	const reference = scanner.referenceMasterDb;
	const sliderNumber = Math.max(1, Math.ceil(plan.sliders.count / 2));
	const shots: {name: string; role: ImageRole; master: number; slider?: number; air?: boolean}[] = [
		...phantomGainStepsDb.map((g) => ({name: `g${g}`, role: 'gain-step' as const, master: g})),
		{name: 'air', role: 'probe-in-air', master: reference, air: true},
		{name: `s${sliderNumber}-max`, role: 'slider-step', master: reference, slider: sliderNumber},
	];
	let region: ImageRegion | null = null;
	let rowsToDepth: RowsToDepth | null = null;
	const images: DemoImage[] = shots.map((shot, k) => {
		const sliderDb = new Array<number>(plan.sliders.count).fill(0);
		if (shot.slider !== undefined) sliderDb[shot.slider - 1] = scanner.sliderTravelDb;
		const settings: AppliedSettings = {sliderDb, masterGainDb: shot.master};
		const noise = speckleFor(phantom, regionWidth, regionHeight, seed + 7919 * (k + 1)).noise;
		const f = simulateFrame({
			plan: phantom,
			scanner,
			settings,
			width: regionWidth,
			height: regionHeight,
			seed,
			fields: {...clamped, noise},
			probeInAir: shot.air ?? false,
			caption: caption(scanner, plan, shot.master, shot.air ? 'AIR' : 'PHANTOM'),
		});
		region = f.region;
		rowsToDepth = f.rowsToDepth;
		// Odd-numbered shots in RGB with coloured text: a session mixing grey and RGB, as exports do.
		const rgb = k % 2 === 1;
		return {
			name: shot.name,
			role: shot.role,
			width: f.width,
			height: f.height,
			channels: rgb ? 3 : 1,
			data: rgb ? greyToRgb(f.grey, f.overlay) : f.grey,
			masterGainDb: shot.master,
			...(shot.slider === undefined ? {} : {slider: shot.slider, position: 1}),
		};
	});
	const cmPerPixel = plan.display.depthCm / regionHeight;
	const phantomModel = pathModelOf(phantom);
	const file = (name: string) => `${name}.${extension}`;
	const session: Record<string, unknown> = {
		format: 'evenecho-scanner-session/1',
		label,
		probe: {centerMhz: plan.probe.centerMhz, bandwidthFraction: plan.probe.bandwidthFraction},
		display: {depthCm: plan.display.depthCm},
		phantom: {alphaDbPerCmMhz: 0.5, exponent: 1, speedMps: 1540},
		region: {columns: [0.3, 0.7]},
		sliders: {count: plan.sliders.count},
		gainSteps: images
			.filter((i) => i.role === 'gain-step')
			.map((i) => ({image: file(i.name), masterGainDb: i.masterGainDb})),
		probeInAir: {image: file('air'), masterGainDb: reference},
		sliderSteps: [{image: file(`s${sliderNumber}-max`), slider: sliderNumber, position: 1, masterGainDb: reference}],
		...(extension === 'png'
			? {pixelScale: {cmPerPixel: round(cmPerPixel, 8), topRowCm: round(rowsToDepth!.topRowCm, 8)}}
			: {}),
	};
	const truth = {
		format: 'evenecho-simulation-truth/1',
		kind: 'phantom-series',
		note: 'Invented demo images: a simulated illustration under the evenecho model, not real scanner data.',
		seed,
		phantom: {alphaDbPerCmMhz: 0.5, exponent: 1, speedMps: 1540, clamped: true},
		probe: plan.probe,
		display: {depthCm: plan.display.depthCm},
		sliders: {count: plan.sliders.count, knots: 'band-centres'},
		scanner: scannerTruth(plan, scanner),
		noiseFloor: depthSteps(plan).map((d) => ({depthCm: d, levelDb: round(noiseLevelDb(scanner, reference, d), 3)})),
		noiseFloorMasterGainDb: reference,
		penetrationCm: nullableRound(phantomPenetrationCm(plan, scanner)),
		phantomLoss: depthSteps(plan).map((d) => ({depthCm: d, lossDb: round(phantomModel.lossAt(d), 3)})),
		images: images.map((i) => ({
			file: file(i.name),
			role: i.role,
			masterGainDb: i.masterGainDb,
			photometric: i.channels === 3 ? 'RGB' : 'MONOCHROME2',
			...(i.slider ? {slider: i.slider, position: i.position, sliderDb: scanner.sliderTravelDb} : {}),
		})),
		region: region!,
		cmPerPixel: round(cmPerPixel, 8),
		rowsToDepth: {topRowCm: round(rowsToDepth!.topRowCm, 8), cmPerRow: round(rowsToDepth!.cmPerRow, 8)},
		overlay: colourOverlayNote,
		constants: realisticConstants,
	};
	return {images, region: region!, cmPerPixel, rowsToDepth: rowsToDepth!, session, appliedSettings: null, truth};
}

function depthSteps(plan: EnginePlan): number[] {
	const out: number[] = [];
	for (let d = 0; d <= plan.display.depthCm + 1e-9; d += 0.25) out.push(round(d, 2));
	return out;
}

function nullableRound(v: number | null): number | null {
	return v === null ? null : round(v, 3);
}

/** Factor on the deepest layer's α0 in the patient image (0.5 → 0.8: a fatty-looking liver). */
export const patientAlphaFactor = 1.6;

export interface PatientOptions {
	/** An anechoic cyst-like disc in the measured columns, in the deep layer. */
	readonly cyst?: boolean;
	/** A bright specular line across the measured columns. */
	readonly brightLine?: boolean;
	/** Factor on the deepest layer's α0 (default patientAlphaFactor; 1 images the plan itself). */
	readonly alphaFactor?: number;
	/** Whole picture size, px (default the 600×480 demo size; tests use smaller ones). */
	readonly size?: {readonly width: number; readonly height: number};
}

/** One patient image of the plan's stack with the deepest layer's true α0 changed. */
export function patientImage(plan: EnginePlan, seed: number, extension: string, options: PatientOptions = {}): DemoSet {
	const size = options.size ?? demoPictureSize;
	const width = size.width - frameMargins.left - frameMargins.right;
	const height = size.height - frameMargins.top - frameMargins.bottom;
	const structures = demoStructures(plan.display.depthCm, {
		cyst: options.cyst ?? false,
		brightLine: options.brightLine ?? false,
	});
	const layerIndex = plan.layers.length - 1;
	const deepest = plan.layers[layerIndex]!;
	const plannedAlpha = deepest.tissue.alphaDbPerCmMhz;
	const trueAlpha = plannedAlpha > 0 ? round(plannedAlpha * (options.alphaFactor ?? patientAlphaFactor), 4) : 0.3;
	const truePlan: EnginePlan = {
		...plan,
		layers: plan.layers.map((l, i) =>
			i === layerIndex ? {...l, tissue: {...l.tissue, alphaDbPerCmMhz: trueAlpha}} : l,
		),
	};
	const scanner = realisticScanner(plan);
	const fit = computeCurve(plan, {band: false}).fit;
	const settings = settingsOfFit(fit);
	const applied = {sliders: settings.sliderDb.map((v) => round(v, 2)), masterGainDb: round(settings.masterGainDb, 2)};
	const f = simulateFrame({
		plan: truePlan,
		scanner,
		settings: {sliderDb: applied.sliders, masterGainDb: applied.masterGainDb},
		width,
		height,
		seed,
		structures,
		caption: caption(scanner, plan, Math.round(applied.masterGainDb), 'PATIENT'),
	});
	const image: DemoImage = {
		name: 'patient',
		role: 'patient',
		width: f.width,
		height: f.height,
		channels: 3,
		data: greyToRgb(f.grey, f.overlay),
		masterGainDb: applied.masterGainDb,
	};
	const cmPerPixel = plan.display.depthCm / height;
	const bands: {depthCm: number; meanLevelDb: number; noiseLevelDb: number; lossDb: number | null}[] = [];
	const rowsPerBand = Math.max(1, Math.round(0.5 / cmPerPixel));
	for (let r = Math.floor(rowsPerBand / 2); r < f.truth.depthCm.length; r += rowsPerBand) {
		const loss = f.truth.lossDb[r]!;
		bands.push({
			depthCm: round(f.truth.depthCm[r]!, 3),
			meanLevelDb: round(f.truth.meanLevelDb[r]!, 3),
			noiseLevelDb: round(f.truth.noiseLevelDb[r]!, 3),
			lossDb: loss === null ? null : round(loss, 3),
		});
	}
	const truth = {
		format: 'evenecho-simulation-truth/1',
		kind: 'patient',
		note: 'Invented demo patient image: a simulated illustration under the evenecho model, not a real patient.',
		seed,
		plan: plan.name,
		layer: layerIndex + 1,
		layerLabel: deepest.tissue.label,
		exponent: deepest.tissue.exponent,
		plannedAlphaDbPerCmMhz: plannedAlpha,
		trueAlphaDbPerCmMhz: trueAlpha,
		applied,
		image: `patient.${extension}`,
		photometric: 'RGB',
		scanner: scannerTruth(plan, scanner),
		bands,
		blockedDepthCm: f.truth.blockedDepthCm,
		structures: {
			note: "x as fractions of the tissue region's width, depths in displayed cm; left out of the band levels above",
			cyst: structures.cyst ?? null,
			brightLine: structures.brightLine ?? null,
		},
		region: f.region,
		cmPerPixel: round(cmPerPixel, 8),
		rowsToDepth: {topRowCm: round(f.rowsToDepth.topRowCm, 8), cmPerRow: round(f.rowsToDepth.cmPerRow, 8)},
		overlay: colourOverlayNote,
		constants: realisticConstants,
	};
	return {
		images: [image],
		region: f.region,
		cmPerPixel,
		rowsToDepth: f.rowsToDepth,
		session: null,
		appliedSettings: applied,
		truth,
	};
}
