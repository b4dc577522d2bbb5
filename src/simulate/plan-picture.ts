/**
 * The two pictures of a plan the console and `preview` show side by side: the plan's stack with
 * the scanner's built-in ramp alone (sliders centred, master at its base) and with the plan's
 * fitted sliders and master. Speckle is made once per size and probe, the gain-free echo map once
 * per stack; a gain change only re-maps grey, so a redraw per keystroke stays cheap.
 */
import type {CurveResult, EnginePlan} from '../engine/types.js';
import {echoImage, type EchoImage} from './echo-image.js';
import {rowEchoes, type RowEchoes} from './echo-rows.js';
import {greyImage} from './grey-image.js';
import {centredSettings, rowGainsDb, settingsOfFit} from './row-gains.js';
import {defaultDynamicRangeDb, plainScanner} from './scanner-behaviour.js';
import {speckleFor} from './simulate-frame.js';
import type {SpeckleFields} from './speckle-field.js';

export type PanelKind = 'ramp' | 'plan';

export interface PlanPictures {
	readonly width: number;
	readonly height: number;
	/** Grey per pixel, row-major; row r shows displayed depth r/height × display depth. */
	readonly ramp: Uint8Array;
	readonly plan: Uint8Array;
	readonly cmPerRow: number;
}

/** What the echo map depends on (not the gains). */
function physicsKey(plan: EnginePlan, width: number, height: number): string {
	return JSON.stringify([
		plan.layers,
		plan.probe,
		plan.scattererExponent,
		plan.display,
		plan.noiseBudgetDb,
		width,
		height,
	]);
}

export interface PictureCache {
	pictures(result: CurveResult, width: number, height: number, dynamicRangeDb?: number): PlanPictures;
}

/** One cache per view; `seed` fixes the speckle so the same plan always looks the same. */
export function createPictureCache(seed = 1): PictureCache {
	let fields: {key: string; value: SpeckleFields} | null = null;
	let echo: {key: string; rows: RowEchoes; image: EchoImage} | null = null;
	return {
		pictures(result, width, height, dynamicRangeDb = defaultDynamicRangeDb) {
			const plan = result.plan;
			const fieldKey = JSON.stringify([
				width,
				height,
				plan.probe.centerMhz,
				plan.probe.bandwidthFraction,
				plan.display.depthCm,
			]);
			if (!fields || fields.key !== fieldKey) fields = {key: fieldKey, value: speckleFor(plan, width, height, seed)};
			const scanner = plainScanner(plan, dynamicRangeDb);
			const key = physicsKey(plan, width, height);
			if (!echo || echo.key !== key) {
				const rows = rowEchoes(plan, height, {topRowCm: 0, cmPerRow: plan.display.depthCm / height});
				echo = {key, rows, image: echoImage(fields.value, rows, scanner.noiseBudgetDb)};
			}
			const depths = echo.rows.depthCm;
			const rampGains = rowGainsDb(plan, scanner, centredSettings(plan, scanner), depths);
			const planGains = rowGainsDb(plan, scanner, settingsOfFit(result.fit), depths);
			return {
				width,
				height,
				ramp: greyImage(echo.image, rampGains, scanner.display),
				plan: greyImage(echo.image, planGains, scanner.display),
				cmPerRow: plan.display.depthCm / height,
			};
		},
	};
}
