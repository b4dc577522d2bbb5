/**
 * The one entry point that reads an image file: bounded and regular-file-only, then DICOM Part 10
 * or PNG by content (the name's extension is not trusted).
 */
import type {PhantomImage} from '../calibration/phantom-image.js';
import {readImageBytes} from './bounded-file.js';
import {readDicomImage} from './dicom-image.js';
import {ImageRefusal} from './image-refusal.js';
import {isPng, readPngImage, type PixelScale} from './png-image.js';

export interface ReadImageOptions {
	/** Frame of a multi-frame DICOM, 1-based. */
	readonly frame?: number;
	/** Depth scale for PNG, and for a DICOM without ultrasound regions. */
	readonly pixelScale?: PixelScale;
	/** How the file is named in messages (e.g. as written in the session). */
	readonly label?: string;
}

function isDicomPart10(bytes: Uint8Array): boolean {
	return (
		bytes.length >= 132 && bytes[128] === 0x44 && bytes[129] === 0x49 && bytes[130] === 0x43 && bytes[131] === 0x4d
	);
}

export function decodeImage(bytes: Uint8Array, options: ReadImageOptions = {}): PhantomImage {
	const label = options.label ?? 'image';
	if (isPng(bytes)) return readPngImage(bytes, label, options.pixelScale);
	if (isDicomPart10(bytes)) {
		return readDicomImage(bytes, label, {
			...(options.frame !== undefined ? {frame: options.frame} : {}),
			...(options.pixelScale ? {pixelScale: options.pixelScale} : {}),
		});
	}
	throw new ImageRefusal(label, 'is neither a DICOM Part 10 file ("DICM" after the 128-byte preamble) nor a PNG');
}

export function readImageFile(path: string, options: ReadImageOptions = {}): PhantomImage {
	const label = options.label ?? path;
	return decodeImage(readImageBytes(path, label), {...options, label});
}
