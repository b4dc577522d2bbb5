/**
 * The border a real scanner draws around its image: a dark surround, a thin frame line, a depth
 * scale with tick marks and numbers, and a line of burned-in text — all outside the image region,
 * where a reader that trusts the region calibration never looks and one that ignores it trips.
 */
import {drawText, glyphHeight} from './pixel-font.js';

export interface ImageRegion {
	/** Inclusive pixel rectangle of the tissue image inside the whole picture. */
	readonly x0: number;
	readonly y0: number;
	readonly x1: number;
	readonly y1: number;
}

export interface FramedImage {
	readonly grey: Uint8Array;
	readonly width: number;
	readonly height: number;
	readonly region: ImageRegion;
	/** 1 where burned-in graphics or text were drawn (writers may colour these in RGB). */
	readonly overlay: Uint8Array;
}

const surroundGrey = 8;
const frameGrey = 96;
const textGrey = 235;
/** Fixed margins around the region, px: a 600×480 picture holds a 490×440 region. */
export const frameMargins = {left: 40, right: 70, top: 24, bottom: 16} as const;
const topMarginPx = frameMargins.top;
const bottomMarginPx = frameMargins.bottom;

/** Puts the region into a bordered picture with a depth scale (cm) and a text line. */
export function frameImage(
	region: Uint8Array,
	width: number,
	height: number,
	depthCm: number,
	caption: string,
): FramedImage {
	const {left, right} = frameMargins;
	const W = left + width + right;
	const H = topMarginPx + height + bottomMarginPx;
	const grey = new Uint8Array(W * H).fill(surroundGrey);
	const overlay = new Uint8Array(W * H);
	for (let y = 0; y < height; y++) grey.set(region.subarray(y * width, (y + 1) * width), (topMarginPx + y) * W + left);
	const plot = (x: number, y: number, v = textGrey) => {
		if (x < 0 || y < 0 || x >= W || y >= H) return;
		if (x >= left && x < left + width && y >= topMarginPx && y < topMarginPx + height) return;
		grey[y * W + x] = v;
		overlay[y * W + x] = 1;
	};
	for (let x = left - 1; x <= left + width; x++) {
		plot(x, topMarginPx - 1, frameGrey);
		plot(x, topMarginPx + height, frameGrey);
	}
	for (let y = topMarginPx - 1; y <= topMarginPx + height; y++) {
		plot(left - 1, y, frameGrey);
		plot(left + width, y, frameGrey);
	}
	const pxPerCm = height / depthCm;
	const labelEvery = depthCm > 12 ? 2 : 1;
	for (let cm = 0; cm <= depthCm + 1e-9; cm++) {
		const y = topMarginPx + Math.round(cm * pxPerCm);
		for (let x = 2; x <= (cm % labelEvery === 0 ? 6 : 4); x++) plot(left + width + x, y);
		if (cm % labelEvery === 0 && cm > 0)
			drawText(String(cm), left + width + 9, y - Math.floor(glyphHeight / 2), (x, yy) => plot(x, yy));
	}
	drawText(caption, left, Math.floor((topMarginPx - glyphHeight) / 2), (x, y) => plot(x, y));
	drawText('CM', left + width + 9, H - bottomMarginPx + 4, (x, y) => plot(x, y));
	return {
		grey,
		width: W,
		height: H,
		region: {x0: left, y0: topMarginPx, x1: left + width - 1, y1: topMarginPx + height - 1},
		overlay,
	};
}
