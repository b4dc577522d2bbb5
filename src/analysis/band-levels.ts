/**
 * Echo level per depth band: the mean grey of the band's speckle pixels over the measured columns,
 * turned into dB through the level map, with its uncertainty from the number of independent speckle
 * cells (band-mean variance σ²_px·S/N_px in grey, converted by the map's slope; shared method notes §1).
 */
import {windowStatistics} from '../speckle/correlation-area.js';
import {rowDepthCm, type GreyFrame, type MeasuredRegion} from './grey-frame.js';
import type {LevelMap} from './level-map.js';
import {maskCodes, type SpeckleMask} from './speckle-mask.js';
import {sdOfMean, z95} from '../speckle/speckle-statistics.js';

/** Band depth, cm: at most 1 cm (the contract), so a slider's band holds one to three of them. */
export const bandDepthCm = 1;
/** A band shallower than this at the bottom of the image is left out, cm. */
const shortestBandCm = 0.5;
/** Fewer speckle pixels than this and a band is not measured at all. */
const fewestPixels = 40;
/** Grey at or below which a pixel is clipped black (a plain log display loses its mean there). */
export const clippedBlackGrey = 5;

export interface BandMeasurement {
	/** Displayed depth of the band's top and bottom edges and of its centre, cm. */
	readonly topCm: number;
	readonly bottomCm: number;
	readonly depthCm: number;
	/** Speckle pixels measured, and the independent cells they hold. */
	readonly pixels: number;
	readonly cells: number;
	/** Mean grey of those pixels, and the level it maps to, dB (NaN when not measured). */
	readonly meanGrey: number;
	readonly levelDb: number;
	/** SD of the band level from the speckle statistics, dB, and the 95 % half-width. */
	readonly sdDb: number;
	readonly halfWidthDb: number;
	/** Fraction of the band's measured pixels that were masked. */
	readonly maskedFraction: number;
	/** Fraction of speckle pixels clipped black. */
	readonly clippedFraction: number;
	/** Pixel rows [first, end) of the band. */
	readonly rows: readonly [number, number];
}

/** The bands covering the region: [k, k+1) cm of displayed depth, clipped to the region. */
export function bandRows(region: MeasuredRegion): {topCm: number; bottomCm: number; rows: [number, number]}[] {
	const out: {topCm: number; bottomCm: number; rows: [number, number]}[] = [];
	const [first, end] = region.rows;
	if (end <= first) return out;
	let r = first;
	while (r < end) {
		const top = rowDepthCm(region, r);
		const bandTop = Math.floor(top / bandDepthCm + 1e-9) * bandDepthCm;
		const bandBottom = bandTop + bandDepthCm;
		let stop = r;
		while (stop < end && rowDepthCm(region, stop) < bandBottom) stop++;
		const topCm = region.topRowCm + r * region.cmPerPixel;
		const bottomCm = region.topRowCm + stop * region.cmPerPixel;
		if (bottomCm - topCm >= shortestBandCm - 1e-9) out.push({topCm, bottomCm, rows: [r, stop]});
		r = stop;
	}
	return out;
}

export function measureBands(
	frame: GreyFrame,
	region: MeasuredRegion,
	mask: SpeckleMask,
	map: LevelMap,
): BandMeasurement[] {
	const use = new Uint8Array(mask.codes.length);
	for (let i = 0; i < use.length; i++) use[i] = mask.codes[i] === maskCodes.speckle ? 1 : 0;
	const [c0, c1] = region.columns;
	return bandRows(region).map(({topCm, bottomCm, rows}) => {
		const stats = windowStatistics({grey: frame.grey, use, width: frame.width, rows, columns: region.columns});
		let clipped = 0;
		for (let r = rows[0]; r < rows[1]; r++) {
			for (let c = c0; c < c1; c++) {
				const i = r * frame.width + c;
				if (use[i] && frame.grey[i]! <= clippedBlackGrey) clipped++;
			}
		}
		const all = (rows[1] - rows[0]) * (c1 - c0);
		const measured = stats.count >= fewestPixels;
		const cells = stats.count / stats.cellAreaPx;
		const sdGrey = sdOfMean(Math.sqrt(stats.variance), stats.count, stats.cellAreaPx);
		const sdDb = measured ? sdGrey * Math.abs(map.slopeDbPerGrey(stats.mean)) : Number.POSITIVE_INFINITY;
		return {
			topCm,
			bottomCm,
			depthCm: (topCm + bottomCm) / 2,
			pixels: stats.count,
			cells: measured ? cells : 0,
			meanGrey: measured ? stats.mean : Number.NaN,
			levelDb: measured ? map.levelDb(stats.mean) : Number.NaN,
			sdDb,
			halfWidthDb: z95 * sdDb,
			maskedFraction: all > 0 ? 1 - stats.count / all : 1,
			clippedFraction: stats.count > 0 ? clipped / stats.count : 0,
			rows,
		};
	});
}
