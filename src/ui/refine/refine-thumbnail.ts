/**
 * The measured still drawn small: the scanner view's thumbnail (grey as shading, the image region's
 * edge, the measured columns marked `:` at its top and bottom) with the analysis's mask over it —
 * a cell in the measured columns whose pixels were mostly left out (anechoic, bright, not speckle,
 * their rings and what lies beneath) shows `/`. Pure, plain characters: no colour needed.
 */
import type {SpeckleMask} from '../../analysis/speckle-mask.js';
import {maskCodes} from '../../analysis/speckle-mask.js';
import {measuredColumns} from '../../analysis/frame-from-image.js';
import type {PhantomImage} from '../../calibration/phantom-image.js';
import {imageThumbnail} from '../scanner/image-thumbnail.js';

export const maskedGlyph = '/';

export function refineThumbnail(image: PhantomImage, mask: SpeckleMask, width: number, height: number): string[] {
	const lines = imageThumbnail(image, measuredColumns, width, height);
	const sx = image.width / width;
	const sy = image.height / height;
	const {region} = image;
	return lines.map((line, r) => {
		const y0 = Math.floor(r * sy);
		const y1 = Math.max(y0 + 1, Math.floor((r + 1) * sy));
		if (y1 <= region.y0 || y0 > region.y1) return line;
		const cells = [...line];
		for (let c = 0; c < cells.length; c++) {
			if (cells[c] === ':' || cells[c] === '|' || cells[c] === '-') continue;
			const x0 = Math.floor(c * sx);
			const x1 = Math.max(x0 + 1, Math.floor((c + 1) * sx));
			let measured = 0;
			let masked = 0;
			for (let y = Math.max(y0, region.y0); y < Math.min(y1, region.y1 + 1); y++) {
				for (let x = x0; x < x1; x++) {
					const code = mask.codes[y * image.width + x];
					if (code === undefined || code === maskCodes.outside || code === maskCodes.notImage) continue;
					measured++;
					if (code !== maskCodes.speckle) masked++;
				}
			}
			if (measured > 0 && masked * 2 > measured) cells[c] = maskedGlyph;
		}
		return cells.join('');
	});
}
