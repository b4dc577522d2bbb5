/**
 * What a simulated scanner really does, written beside demo images so that tests of measurement
 * (scanner profiles, refinement) can compare what they recover with what was used.
 *
 * Level scale: 0 dB is the reference echo right under the skin at the reference master gain with
 * every slider centred. A band's displayed level is master − referenceMaster + R(z) + sliders(z) −
 * L(z); echo and noise powers add. The grey map gives the MEAN grey of fully developed speckle at a
 * mean intensity level (what a gain-step calibration recovers); the pixel map is the compression
 * each pixel went through.
 */
import {pathModelOf} from '../engine/compensation-curve.js';
import type {EnginePlan} from '../engine/types.js';
import {meanGreyOfSpeckle} from './display-map.js';
import {phantomPlan, type ScannerBehaviour} from './scanner-behaviour.js';

export interface ScannerTruth {
	readonly levelScale: string;
	readonly referenceMasterDb: number;
	readonly pixelMap: {
		readonly topDb: number;
		readonly dynamicRangeDb: number;
		readonly curveExponent: number;
		readonly formula: string;
	};
	readonly greyMap: readonly {grey: number; levelDb: number}[];
	readonly depthResponse: readonly {depthCm: number; gainDb: number}[];
	readonly sliderTravelDb: number;
	readonly sliderInfluence: string;
	readonly noiseBudgetDb: number;
	readonly smoothingFwhmPx: number;
}

const round = (v: number, digits = 3) => Number(v.toFixed(digits));

/** Mean level (dB) whose speckle shows a given mean grey, by bisection on the monotone map. */
function levelForMeanGrey(scanner: ScannerBehaviour, grey: number): number {
	let lo = scanner.display.topDb - scanner.display.dynamicRangeDb - 20;
	let hi = scanner.display.topDb + 20;
	// 30 halvings of a 100 dB bracket: 1e-7 dB.
	for (let i = 0; i < 30; i++) {
		const mid = (lo + hi) / 2;
		if (meanGreyOfSpeckle(scanner.display, mid) < grey) lo = mid;
		else hi = mid;
	}
	return (lo + hi) / 2;
}

/** Grey maps already worked out, by display map: each costs millions of map evaluations, and demo sets repeat them. */
const greyMaps = new Map<string, readonly {grey: number; levelDb: number}[]>();

function greyMapOf(scanner: ScannerBehaviour): readonly {grey: number; levelDb: number}[] {
	const m = scanner.display;
	const key = `${m.topDb}/${m.dynamicRangeDb}/${m.curveExponent}`;
	let map = greyMaps.get(key);
	if (!map) {
		const points: {grey: number; levelDb: number}[] = [];
		for (let grey = 5; grey <= 250; grey += 5) points.push({grey, levelDb: round(levelForMeanGrey(scanner, grey))});
		map = points;
		greyMaps.set(key, map);
	}
	return map;
}

export function scannerTruth(plan: EnginePlan, scanner: ScannerBehaviour): ScannerTruth {
	const greyMap = greyMapOf(scanner).map((p) => ({...p}));
	const depthResponse: {depthCm: number; gainDb: number}[] = [];
	const stepCm = 0.25;
	for (let d = 0; d <= plan.display.depthCm + 1e-9; d += stepCm)
		depthResponse.push({depthCm: round(d, 2), gainDb: round(scanner.depthResponseDb(d))});
	const m = scanner.display;
	return {
		levelScale:
			'0 dB = reference echo under the skin at the reference master gain, sliders centred; ' +
			'level = master − referenceMaster + depth response + sliders − loss',
		referenceMasterDb: scanner.referenceMasterDb,
		pixelMap: {
			topDb: m.topDb,
			dynamicRangeDb: m.dynamicRangeDb,
			curveExponent: m.curveExponent,
			formula: 'grey = 255·u^curveExponent, u = (20·log10 A − (topDb − dynamicRangeDb))/dynamicRangeDb clipped to 0–1',
		},
		greyMap,
		depthResponse,
		sliderTravelDb: scanner.sliderTravelDb,
		sliderInfluence: "hat: full at the slider's knot, falling linearly to 0 at the neighbouring knots (band centres)",
		noiseBudgetDb: round(scanner.noiseBudgetDb),
		smoothingFwhmPx: scanner.smoothingPx,
	};
}

/** Noise level after gain at the given master (sliders centred) and depth, dB on the level scale. */
export function noiseLevelDb(scanner: ScannerBehaviour, masterGainDb: number, depthCm: number): number {
	return masterGainDb - scanner.referenceMasterDb + scanner.depthResponseDb(depthCm) - scanner.noiseBudgetDb;
}

/** Depth where the phantom's echo-to-noise is 0 dB (its loss equals the noise budget), cm, or null. */
export function phantomPenetrationCm(plan: EnginePlan, scanner: ScannerBehaviour): number | null {
	return pathModelOf(phantomPlan(plan)).depthForLoss(scanner.noiseBudgetDb, plan.display.depthCm);
}
