/**
 * One simulated patient still written as a file by our own writers and read back by the image reader:
 * DICOM with its ultrasound region, or PNG cropped to the tissue region and read with its pixel scale
 * (a PNG carries no region of its own).
 */
import {writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {imageFiles} from '../../src/cli/simulate-command.js';
import {encodePng} from '../../src/image/png-writer.js';
import {readImageFile} from '../../src/image/read-image.js';
import type {DemoSet} from '../../src/simulate/demo-images.js';

/** The image read back, and the offset from the simulated picture to it (the PNG's crop). */
export function writtenAndRead(dir: string, planName: string, set: DemoSet, seed: number, format: 'dicom' | 'png') {
	if (format === 'dicom') {
		const path = join(dir, `patient-${seed}.dcm`);
		writeFileSync(path, imageFiles(set, 'dicom', 'patient', seed, planName)[0]!.data);
		return {image: readImageFile(path), shift: {x: 0, y: 0}};
	}
	const img = set.images[0]!;
	const {x0, y0, x1, y1} = set.region;
	const w = x1 - x0 + 1;
	const h = y1 - y0 + 1;
	const data = new Uint8Array(w * h * img.channels);
	for (let y = 0; y < h; y++) {
		const from = ((y + y0) * img.width + x0) * img.channels;
		data.set(img.data.subarray(from, from + w * img.channels), y * w * img.channels);
	}
	const path = join(dir, `patient-${seed}.png`);
	writeFileSync(path, encodePng({width: w, height: h, channels: img.channels, data}));
	return {image: readImageFile(path, {pixelScale: {cmPerPixel: set.cmPerPixel, topRowCm: 0}}), shift: {x: x0, y: y0}};
}
