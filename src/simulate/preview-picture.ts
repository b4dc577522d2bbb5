/**
 * The plan's picture as one grey image for `evenecho preview --png`: one panel alone (row r shows
 * displayed depth r/height × display depth), or both side by side under a strip of burned-in titles
 * that say it is an illustration.
 */
import type {CurveResult} from '../engine/types.js';
import {drawText, glyphHeight} from './pixel-font.js';
import type {PanelKind, PictureCache} from './plan-picture.js';

export interface GreyPicture {
	readonly width: number;
	readonly height: number;
	readonly grey: Uint8Array;
	/** Rows above the first picture row (the title strip), px. */
	readonly topStripPx: number;
}

const gapPx = 8;
const stripPx = glyphHeight + 6;
const stripGrey = 0;
const textGrey = 230;

export const panelCaptions: Record<PanelKind, string> = {ramp: 'BUILT-IN RAMP ONLY', plan: 'THIS PLAN'};

export function previewPicture(
	result: CurveResult,
	cache: PictureCache,
	panel: PanelKind | 'both',
	width: number,
	height: number,
	dynamicRangeDb: number,
): GreyPicture {
	const pics = cache.pictures(result, width, height, dynamicRangeDb);
	if (panel !== 'both') return {width, height, grey: panel === 'ramp' ? pics.ramp : pics.plan, topStripPx: 0};
	const W = 2 * width + gapPx;
	const H = height + stripPx;
	const grey = new Uint8Array(W * H).fill(stripGrey);
	for (let y = 0; y < height; y++) {
		grey.set(pics.ramp.subarray(y * width, (y + 1) * width), (y + stripPx) * W);
		grey.set(pics.plan.subarray(y * width, (y + 1) * width), (y + stripPx) * W + width + gapPx);
	}
	const plot = (x: number, y: number) => {
		if (x >= 0 && x < W && y >= 0 && y < stripPx) grey[y * W + x] = textGrey;
	};
	// With a measured scanner the sliders-centred panel shows its measured depth gain, not the ramp.
	const rampCaption = result.plan.scanner ? 'MEASURED GAIN ONLY' : panelCaptions.ramp;
	drawText(`${rampCaption}  ILLUSTRATION`, 2, 3, plot);
	drawText(panelCaptions.plan, width + gapPx + 2, 3, plot);
	return {width: W, height: H, grey, topStripPx: stripPx};
}
