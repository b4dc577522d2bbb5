/**
 * Mean grey per depth band of one image, with the number of independent speckle cells behind it.
 *
 * Pixels are not independent: speckle is correlated over a cell. N_eff = area / S, with S the
 * integral of the central lobe of the autocorrelation coefficient of the (log-compressed) image;
 * var(band mean) = σ²_px · S / N_px (Wagner et al. 1983; shared reference §1, checked there
 * against simulation to within 1–14 %). On processed (smoothed) images S grows with the smoothing,
 * so the count stays honest.
 */
import {windowStatistics} from '../speckle/correlation-area.js';
import {sdOfMean} from '../speckle/speckle-statistics.js';
import {rowDepthCm, type PhantomImage} from './phantom-image.js';

/** Depth bands are this tall, cm (the depth response is sampled every 0.5 cm). */
export const bandHeightCm = 0.5;
/** Band means at or beyond these greys are clipped or all but black and carry no level. */
export const usableGrey = {low: 8, high: 247} as const;

export interface BandMean {
	readonly band: number;
	readonly depthCm: number;
	/** Mean grey of the measured pixels. */
	readonly meanGrey: number;
	/** Standard deviation of the pixels' grey. */
	readonly sdGrey: number;
	readonly pixels: number;
	/** Independent speckle cells: pixels / S. */
	readonly cells: number;
	/** SD of the band mean, grey levels: σ_px·√(S/N_px). */
	readonly sdMeanGrey: number;
}

export interface ImageBands {
	readonly bands: readonly BandMean[];
	/** Speckle cell area S, pixels. */
	readonly cellAreaPx: number;
	/** Measured columns, inclusive. */
	readonly columns: readonly [number, number];
	/** Fraction of the measured pixels that were masked (not grey). */
	readonly maskedFraction: number;
}

/** First and last measured column: the `columns` fraction of the region's width. */
export function measuredColumns(image: PhantomImage, fraction: readonly [number, number]): [number, number] {
	const {x0, x1} = image.region;
	const w = x1 - x0 + 1;
	const a = x0 + Math.floor(fraction[0] * w);
	const b = Math.max(a, x0 + Math.ceil(fraction[1] * w) - 1);
	return [a, Math.min(b, x1)];
}

/**
 * Speckle cell area S (pixels), from the image's own autocorrelation (src/speckle, the estimator the
 * patient-image analysis uses too), on the middle half of the region's rows in the measured columns,
 * skipping masked pixels. Each row is taken about its own mean: down half a phantom image the
 * attenuation trend would otherwise read as axial correlation.
 */
export function speckleCellArea(image: PhantomImage, cols: readonly [number, number]): number {
	const {y0, y1} = image.region;
	const h = y1 - y0 + 1;
	const use = image.mask.map((m) => (m ? 0 : 1));
	const rows: [number, number] = [y0 + Math.floor(h / 4), y0 + Math.floor((3 * h) / 4) + 1];
	return windowStatistics({
		grey: image.grey,
		use,
		width: image.width,
		rows,
		columns: [cols[0], cols[1] + 1],
		rowMeans: true,
	}).cellAreaPx;
}

/** Band means over the measured columns, bands of bandHeightCm from 0 to depthCm. */
export function bandMeans(
	image: PhantomImage,
	fraction: readonly [number, number],
	depthCm: number,
	cellAreaPx?: number,
): ImageBands {
	const cols = measuredColumns(image, fraction);
	const s = cellAreaPx ?? speckleCellArea(image, cols);
	const nBands = Math.ceil(depthCm / bandHeightCm - 1e-9);
	const sum = new Float64Array(nBands);
	const sum2 = new Float64Array(nBands);
	const count = new Float64Array(nBands);
	let masked = 0;
	let seen = 0;
	const {width, grey, mask} = image;
	for (let y = image.region.y0; y <= image.region.y1; y++) {
		const b = Math.floor(rowDepthCm(image, y) / bandHeightCm);
		if (b < 0 || b >= nBands) continue;
		for (let x = cols[0]; x <= cols[1]; x++) {
			const i = y * width + x;
			seen++;
			if (mask[i]) {
				masked++;
				continue;
			}
			const g = grey[i]!;
			sum[b] = sum[b]! + g;
			sum2[b] = sum2[b]! + g * g;
			count[b] = count[b]! + 1;
		}
	}
	const bands: BandMean[] = [];
	for (let b = 0; b < nBands; b++) {
		const n = count[b]!;
		if (n < 2) continue;
		const mean = sum[b]! / n;
		const sd = Math.sqrt(Math.max(0, sum2[b]! / n - mean * mean));
		bands.push({
			band: b,
			depthCm: (b + 0.5) * bandHeightCm,
			meanGrey: mean,
			sdGrey: sd,
			pixels: n,
			cells: n / s,
			sdMeanGrey: sdOfMean(sd, n, s),
		});
	}
	return {bands, cellAreaPx: s, columns: cols, maskedFraction: seen ? masked / seen : 0};
}
