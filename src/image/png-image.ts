/**
 * PNG stills (8- or 16-bit grey, grey + alpha, RGB, RGBA, or indexed colour), decoded by fast-png.
 * A PNG carries no depth scale, so the session's pixelScale gives it: `topRowCm` is the displayed
 * depth of the top edge of row 0 and `cmPerPixel` the pixel size. The whole image is measured.
 */
import {convertIndexedToRgb, decode} from 'fast-png';
import type {PhantomImage} from '../calibration/phantom-image.js';
import {greyFromMonochrome, greyFromRgb, type GreyPlane} from './grey-levels.js';
import {ImageRefusal, imageLimits} from './image-refusal.js';

export interface PixelScale {
	readonly cmPerPixel: number;
	readonly topRowCm: number;
}

const signature = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

export function isPng(bytes: Uint8Array): boolean {
	return bytes.length >= 8 && signature.every((b, i) => bytes[i] === b);
}

/** Width and height from the IHDR chunk, read before anything is inflated. */
function headerSize(bytes: Uint8Array, label: string): {width: number; height: number} {
	const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	if (bytes.length < 24 || String.fromCharCode(...bytes.subarray(12, 16)) !== 'IHDR') {
		throw new ImageRefusal(`${label}: PNG header (IHDR)`, 'is missing; the file is truncated or not a PNG');
	}
	return {width: view.getUint32(16), height: view.getUint32(20)};
}

export function readPngImage(bytes: Uint8Array, label: string, pixelScale: PixelScale | undefined): PhantomImage {
	const {width, height} = headerSize(bytes, label);
	if (width < 1 || height < 1 || width > imageLimits.maxSidePx || height > imageLimits.maxSidePx) {
		throw new ImageRefusal(
			`${label}: PNG header (IHDR) width × height`,
			`claims ${width} × ${height} pixels; images from 1 to ${imageLimits.maxSidePx} pixels a side are read`,
		);
	}
	if (!pixelScale)
		throw new ImageRefusal('pixelScale', `is needed for the PNG image ${label} (cmPerPixel and topRowCm)`);
	let png: ReturnType<typeof decode>;
	try {
		png = decode(bytes);
	} catch (error) {
		throw new ImageRefusal(
			label,
			`is not a readable PNG (${String((error as Error)?.message ?? error).slice(0, 160)})`,
		);
	}
	const plane = pngPlane(png, label);
	const notes = plane.colouredPixels ? [`${plane.colouredPixels} coloured pixels masked`] : [];
	return {
		width: png.width,
		height: png.height,
		grey: plane.grey,
		mask: plane.mask,
		region: {x0: 0, y0: 0, x1: png.width - 1, y1: png.height - 1},
		rows: {originCm: pixelScale.topRowCm + pixelScale.cmPerPixel / 2, cmPerRow: pixelScale.cmPerPixel},
		cmPerColumn: pixelScale.cmPerPixel,
		depthScaleFrom: 'pixel-scale',
		notes,
	};
}

function pngPlane(png: ReturnType<typeof decode>, label: string): GreyPlane {
	const n = png.width * png.height;
	if (png.palette) {
		const rgb = convertIndexedToRgb(png);
		const step = rgb.length / n;
		return greyFromRgb(png.width, png.height, (i, out) => {
			for (let c = 0; c < 3; c++) out[c] = rgb[step * i + c]!;
		});
	}
	if (png.depth !== 8 && png.depth !== 16) {
		throw new ImageRefusal(`${label}: PNG bit depth`, `is ${png.depth}; 8- and 16-bit images are read`);
	}
	const max = png.depth === 16 ? 65535 : 255;
	const data = png.data;
	const ch = png.channels;
	if (ch === 1 || ch === 2) {
		const values = ch === 1 ? data : Float32Array.from({length: n}, (_, i) => data[2 * i]!);
		return greyFromMonochrome(values, n, max, false);
	}
	const scale = 255 / max;
	return greyFromRgb(png.width, png.height, (i, out) => {
		for (let c = 0; c < 3; c++) out[c] = data[ch * i + c]! * scale;
	});
}
