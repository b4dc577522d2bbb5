/**
 * One calibration image drawn small in plain characters (no colour needed): the grey as a shading
 * ramp, the measured region's edge as `|` and `-` where the image region ends, and the measured
 * columns marked `:` at the top and bottom. Pure.
 */
import {measuredColumns} from '../../calibration/band-statistics.js';
import type {PhantomImage} from '../../calibration/phantom-image.js';

/** Light to dark is dark to bright on a terminal background: space for black, @ for white. */
const ramp = ' .:-=+*#%@';

export function imageThumbnail(
	image: PhantomImage,
	columns: readonly [number, number],
	width: number,
	height: number,
): string[] {
	const {region} = image;
	const [c0, c1] = measuredColumns(image, columns);
	const lines: string[] = [];
	const sx = image.width / width;
	const sy = image.height / height;
	for (let r = 0; r < height; r++) {
		let line = '';
		const y0 = Math.floor(r * sy);
		const y1 = Math.max(y0 + 1, Math.floor((r + 1) * sy));
		for (let c = 0; c < width; c++) {
			const x0 = Math.floor(c * sx);
			const x1 = Math.max(x0 + 1, Math.floor((c + 1) * sx));
			const insideX = x1 > region.x0 && x0 <= region.x1;
			const insideY = y1 > region.y0 && y0 <= region.y1;
			const edgeX = insideY && ((x0 <= region.x0 && x1 > region.x0) || (x0 <= region.x1 && x1 > region.x1));
			const edgeY = insideX && ((y0 <= region.y0 && y1 > region.y0) || (y0 <= region.y1 && y1 > region.y1));
			const measured = x1 > c0 && x0 <= c1;
			if (edgeY) {
				line += measured ? ':' : '-';
				continue;
			}
			if (edgeX) {
				line += '|';
				continue;
			}
			let sum = 0;
			let n = 0;
			for (let y = y0; y < y1; y += Math.max(1, Math.floor((y1 - y0) / 3))) {
				for (let x = x0; x < x1; x += Math.max(1, Math.floor((x1 - x0) / 3))) {
					sum += image.grey[y * image.width + x]!;
					n++;
				}
			}
			const v = n ? sum / n : 0;
			line += ramp[Math.min(ramp.length - 1, Math.floor((v / 256) * ramp.length))]!;
		}
		lines.push(line);
	}
	return lines;
}
