/**
 * From the gain-free echo map to 8-bit grey: add each row's gain, compress into the dynamic range
 * through the display map, then (realistic scanner only) smooth a little. Cheap enough to run on
 * every keystroke: one multiply-add per pixel on the plain logarithmic map.
 */
import {greyOfDb} from './display-map.js';
import type {EchoImage} from './echo-image.js';
import type {DisplayMap} from './scanner-behaviour.js';

/** Grey levels of the image region (row-major, width × height). */
export function greyImage(image: EchoImage, rowGainDb: Float64Array, map: DisplayMap, smoothingPx = 0): Uint8Array {
	const {width, height, echoDb} = image;
	if (smoothingPx > 0 || map.curveExponent !== 1) {
		const grey = new Float32Array(width * height);
		for (let r = 0; r < height; r++) {
			const g = rowGainDb[r]!;
			for (let i = r * width; i < (r + 1) * width; i++) grey[i] = greyOfDb(map, echoDb[i]! + g);
		}
		return toBytes(smoothingPx > 0 ? smoothGrey(grey, width, height, smoothingPx) : grey);
	}
	// Plain map: grey = 255·(level − (top − DR))/DR, one multiply-add; the clamped array rounds and clips.
	const out = new Uint8ClampedArray(width * height);
	const scale = 255 / map.dynamicRangeDb;
	for (let r = 0; r < height; r++) {
		const offset = (rowGainDb[r]! - (map.topDb - map.dynamicRangeDb)) * scale;
		for (let i = r * width; i < (r + 1) * width; i++) out[i] = echoDb[i]! * scale + offset;
	}
	return new Uint8Array(out.buffer);
}

function toBytes(grey: Float32Array): Uint8Array {
	const out = new Uint8ClampedArray(grey.length);
	out.set(grey);
	return new Uint8Array(out.buffer);
}

/** Normalised Gaussian taps (sum 1) for a FWHM in pixels. */
function smoothingTaps(fwhmPx: number): Float32Array {
	const sigma = fwhmPx / 2.3548;
	const radius = Math.max(1, Math.ceil(2.5 * sigma));
	const taps = new Float32Array(2 * radius + 1);
	let sum = 0;
	for (let k = -radius; k <= radius; k++) {
		const w = Math.exp(-(k * k) / (2 * sigma * sigma));
		taps[k + radius] = w;
		sum += w;
	}
	for (let k = 0; k < taps.length; k++) taps[k]! /= sum;
	return taps;
}

/** Separable smoothing of grey values; edges repeat the nearest pixel. Linear, so band means of
 * unclipped grey are kept. */
export function smoothGrey(grey: Float32Array, width: number, height: number, fwhmPx: number): Float32Array {
	const taps = smoothingTaps(fwhmPx);
	const radius = (taps.length - 1) / 2;
	const across = new Float32Array(grey.length);
	for (let y = 0; y < height; y++) {
		const row = y * width;
		for (let x = 0; x < width; x++) {
			let s = 0;
			for (let k = -radius; k <= radius; k++)
				s += taps[k + radius]! * grey[row + Math.min(width - 1, Math.max(0, x + k))]!;
			across[row + x] = s;
		}
	}
	const out = new Float32Array(grey.length);
	for (let y = 0; y < height; y++) {
		for (let k = -radius; k <= radius; k++) {
			const w = taps[k + radius]!;
			const src = Math.min(height - 1, Math.max(0, y + k)) * width;
			const dst = y * width;
			for (let x = 0; x < width; x++) out[dst + x]! += w * across[src + x]!;
		}
	}
	return out;
}
