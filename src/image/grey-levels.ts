/**
 * Turns decoded samples into luma grey levels and marks the pixels that are not grey.
 *
 * Colour overlays and coloured text carry no echo level. A pixel whose channels spread by more than
 * a small threshold (|R−G| + |G−B|) is masked, and the mask is widened a little because JPEG chroma
 * bleeds into neighbours (thresholds after the shared reference's masking rules; tuned, no source).
 */

/** Channel spread above which a pixel counts as coloured, grey levels. */
export const colourSpreadLimit = 20;
/** Pixels around a coloured one that are masked too (JPEG chroma bleed). */
export const colourMaskGrowPx = 2;

export interface GreyPlane {
	readonly grey: Float32Array;
	readonly mask: Uint8Array;
	/** How many pixels were coloured before widening. */
	readonly colouredPixels: number;
}

/** Grey from one sample per pixel, scaled to 0–255 from `maxValue`; nothing masked. */
export function greyFromMonochrome(
	samples: ArrayLike<number>,
	count: number,
	maxValue: number,
	invert: boolean,
): GreyPlane {
	const grey = new Float32Array(count);
	const scale = 255 / maxValue;
	// 8-bit MONOCHROME2, the usual export: a native copy, no per-pixel work.
	if (scale === 1 && !invert && samples instanceof Uint8Array) {
		grey.set(samples.subarray(0, count));
		return {grey, mask: new Uint8Array(count), colouredPixels: 0};
	}
	for (let i = 0; i < count; i++) {
		const v = samples[i]! * scale;
		grey[i] = invert ? 255 - v : v;
	}
	return {grey, mask: new Uint8Array(count), colouredPixels: 0};
}

/**
 * Luma and the colour mask from RGB samples already on 0–255. `at(i)` gives pixel i's channels,
 * so interleaved, planar and converted (YBR, palette) sources share one loop.
 */
export function greyFromRgb(width: number, height: number, rgbAt: (i: number, out: Float32Array) => void): GreyPlane {
	const n = width * height;
	const grey = new Float32Array(n);
	const coloured = new Uint8Array(n);
	const px = new Float32Array(3);
	let colouredPixels = 0;
	for (let i = 0; i < n; i++) {
		rgbAt(i, px);
		colouredPixels += putPixel(grey, coloured, i, px[0]!, px[1]!, px[2]!);
	}
	return planeOf(grey, coloured, colouredPixels, width, height);
}

/** The same as greyFromRgb for 8-bit interleaved RGB (the usual export), without a call per pixel. */
export function greyFromInterleavedRgb(width: number, height: number, rgb: Uint8Array): GreyPlane {
	const n = width * height;
	const grey = new Float32Array(n);
	const coloured = new Uint8Array(n);
	let colouredPixels = 0;
	for (let i = 0, k = 0; i < n; i++, k += 3) {
		colouredPixels += putPixel(grey, coloured, i, rgb[k]!, rgb[k + 1]!, rgb[k + 2]!);
	}
	return planeOf(grey, coloured, colouredPixels, width, height);
}

/** Pixel i's luma; marks it when its channels spread (a colour overlay). Returns 1 if marked. */
function putPixel(grey: Float32Array, coloured: Uint8Array, i: number, r: number, g: number, b: number): number {
	grey[i] = 0.299 * r + 0.587 * g + 0.114 * b;
	if (Math.abs(r - g) + Math.abs(g - b) <= colourSpreadLimit) return 0;
	coloured[i] = 1;
	return 1;
}

/** The plane, with the colour mask grown over the overlay's anti-aliased edge. */
function planeOf(
	grey: Float32Array,
	coloured: Uint8Array,
	colouredPixels: number,
	width: number,
	height: number,
): GreyPlane {
	const mask = colouredPixels ? grow(coloured, width, height, colourMaskGrowPx) : coloured;
	return {grey, mask, colouredPixels};
}

/** Square dilation, done as a row pass then a column pass. */
function grow(mask: Uint8Array, width: number, height: number, r: number): Uint8Array {
	const rowPass = new Uint8Array(mask.length);
	for (let y = 0; y < height; y++) {
		const o = y * width;
		for (let x = 0; x < width; x++) {
			if (!mask[o + x]) continue;
			for (let k = Math.max(0, x - r); k <= Math.min(width - 1, x + r); k++) rowPass[o + k] = 1;
		}
	}
	const out = new Uint8Array(mask.length);
	for (let y = 0; y < height; y++) {
		for (let x = 0; x < width; x++) {
			if (!rowPass[y * width + x]) continue;
			for (let k = Math.max(0, y - r); k <= Math.min(height - 1, y + r); k++) out[k * width + x] = 1;
		}
	}
	return out;
}

/** Full-range YCbCr (DICOM YBR_FULL) to RGB, ITU-R BT.601 coefficients. */
export function ybrToRgb(y: number, cb: number, cr: number, out: Float32Array): void {
	out[0] = y + 1.402 * (cr - 128);
	out[1] = y - 0.344136 * (cb - 128) - 0.714136 * (cr - 128);
	out[2] = y + 1.772 * (cb - 128);
}
