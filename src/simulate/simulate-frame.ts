/**
 * One simulated B-mode frame of a plan's layer stack, in one call:
 *   simulateFrame({plan, settings, scanner, width, height, seed}) → {grey, width, height, rowsToDepth, region, truth}
 * An illustration of a uniform reference scatterer under this model — no tissue-specific
 * backscatter, focusing beyond the scanner's depth response, or clutter — not a prediction of a
 * patient's image.
 */
import type {EnginePlan} from '../engine/types.js';
import {echoImage, rowMeanLevelDb} from './echo-image.js';
import {rowEchoes, type RowsToDepth} from './echo-rows.js';
import {greyImage} from './grey-image.js';
import {centredSettings, rowGainsDb, type AppliedSettings} from './row-gains.js';
import {plainScanner, type ScannerBehaviour} from './scanner-behaviour.js';
import {frameImage, type ImageRegion} from './scanner-frame.js';
import {makeSpeckle, speckleCellOf, type SpeckleFields} from './speckle-field.js';
import {drawStructures, type PatientStructures} from './patient-structures.js';

export interface FrameRequest {
	/** The stack that is imaged (for demo images: the true stack, not the planned one). */
	readonly plan: EnginePlan;
	/** Applied sliders and master; default every slider centred, master at the scanner's reference. */
	readonly settings?: AppliedSettings;
	/** Default: the planner's own model (plainScanner). */
	readonly scanner?: ScannerBehaviour;
	/** Size of the image region, px. Row r shows displayed depth r/height × display depth. */
	readonly width: number;
	readonly height: number;
	readonly seed: number;
	/** Burned-in text line of a framed (realistic) picture. */
	readonly caption?: string;
	/** Probe held in air: no echo at all, only the scanner's noise. */
	readonly probeInAir?: boolean;
	/** Non-speckle structures drawn in (demo patient images). */
	readonly structures?: PatientStructures;
	/** Re-use fields made earlier for the same size and probe (a gain change never re-draws speckle). */
	readonly fields?: SpeckleFields;
}

/** What was used to make the frame, row by row of the image region. */
export interface FrameTruth {
	readonly depthCm: number[];
	/** Gain applied, dB re the reference echo at the skin at the reference master. */
	readonly gainDb: number[];
	/** Round-trip loss of the reference echo, dB; null below a barrier. */
	readonly lossDb: (number | null)[];
	/** Mean intensity level of echo plus noise after gain, dB (what the display map receives). */
	readonly meanLevelDb: number[];
	/** Noise level after gain, dB. */
	readonly noiseLevelDb: number[];
	readonly noiseBudgetDb: number;
	readonly blockedDepthCm: number | null;
}

export interface SimulatedFrame {
	readonly grey: Uint8Array;
	readonly width: number;
	readonly height: number;
	/** Whole-picture row → displayed depth (negative above the skin in a framed picture). */
	readonly rowsToDepth: RowsToDepth;
	/** The tissue image inside the picture (the whole picture when not framed). */
	readonly region: ImageRegion;
	/** Burned-in graphics mask, or null when not framed. */
	readonly overlay: Uint8Array | null;
	readonly truth: FrameTruth;
}

/** Speckle fields for an image region of a plan's display (cell size from its probe). */
export function speckleFor(plan: EnginePlan, width: number, height: number, seed: number): SpeckleFields {
	const cell = speckleCellOf(plan.probe);
	const cmPerPx = plan.display.depthCm / height;
	return makeSpeckle({
		width,
		height,
		axialCellPx: cell.axialCm / cmPerPx,
		lateralCellPx: cell.lateralCm / cmPerPx,
		seed,
	});
}

export function simulateFrame(req: FrameRequest): SimulatedFrame {
	const {plan, width, height} = req;
	const scanner = req.scanner ?? plainScanner(plan);
	const settings = req.settings ?? centredSettings(plan, scanner);
	const fields = req.fields ?? speckleFor(plan, width, height, req.seed);
	const regionRows: RowsToDepth = {topRowCm: 0, cmPerRow: plan.display.depthCm / height};
	const rows = rowEchoes(plan, height, regionRows, req.probeInAir ?? false);
	const gains = rowGainsDb(plan, scanner, settings, rows.depthCm);
	const plainEcho = echoImage(fields, rows, scanner.noiseBudgetDb);
	const image = req.structures
		? drawStructures(plainEcho, fields, [...rows.lossDb], scanner.noiseBudgetDb, regionRows.cmPerRow, req.structures)
		: plainEcho;
	const region = greyImage(image, gains, scanner.display, scanner.smoothingPx);
	const truth: FrameTruth = {
		depthCm: [...rows.depthCm],
		gainDb: [...gains],
		lossDb: [...rows.lossDb].map((l) => (Number.isNaN(l) ? null : l)),
		meanLevelDb: [...rows.lossDb].map((l, r) => rowMeanLevelDb(l, scanner.noiseBudgetDb) + gains[r]!),
		noiseLevelDb: [...gains].map((g) => g - scanner.noiseBudgetDb),
		noiseBudgetDb: scanner.noiseBudgetDb,
		blockedDepthCm: rows.blockedDepthCm,
	};
	if (!scanner.framed) {
		return {
			grey: region,
			width,
			height,
			rowsToDepth: regionRows,
			region: {x0: 0, y0: 0, x1: width - 1, y1: height - 1},
			overlay: null,
			truth,
		};
	}
	const framed = frameImage(region, width, height, plan.display.depthCm, req.caption ?? 'EVENECHO SIMULATED');
	return {
		grey: framed.grey,
		width: framed.width,
		height: framed.height,
		rowsToDepth: {topRowCm: -framed.region.y0 * regionRows.cmPerRow, cmPerRow: regionRows.cmPerRow},
		region: framed.region,
		overlay: framed.overlay,
		truth,
	};
}
