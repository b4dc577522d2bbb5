/**
 * Which pixels look like fully developed speckle from tissue. Only those are averaged into band
 * levels; the rest are masked with a stated test, block by block (blocks of about 30 speckle cells,
 * so a block's level scatters by ~1 dB):
 * - not image data: fewer than half of the block's pixels valid (overlay, text, outside the region);
 * - anechoic (cyst, vessel, bladder) or shadow: block level ≥ 6 dB below the median block level
 *   within ±1 cm of depth;
 * - bright (specular line, calcification) or enhanced: ≥ 6 dB above it, or more than 5 % of the
 *   pixels 12 dB or more above it (in speckle that happens to 0.014 % of pixels: the intensity is
 *   exponential, P(I > 8.9·mean) = e^−8.9), or 20 % of the pixels saturated (grey ≥ 250);
 * - not speckle-like: the block's SD (in dB) outside 0.5–1.6 × the median block SD nearby (speckle
 *   has a fixed SD at any level, Kaplan & Ma 1994; smooth fluid, clutter and edges do not);
 * - the ring of blocks around any of these (partly covered blocks), and blocks in the same columns
 *   beneath an anechoic or bright structure while their level stays more than 3 dB from the median
 *   (acoustic shadow or enhancement).
 * Thresholds after the shared method notes §3 (to tune); the block geometry is the image's own.
 */
import type {GreyFrame, MeasuredRegion} from './grey-frame.js';
import type {LevelMap} from './level-map.js';

export const maskCodes = {
	speckle: 0,
	notImage: 1,
	anechoic: 2,
	bright: 3,
	notSpeckle: 4,
	edge: 5,
	beneath: 6,
	outside: 7,
} as const;
export type MaskReason = keyof typeof maskCodes;

export const maskThresholds = {
	levelDb: 6,
	brightPixelDb: 12,
	brightPixelFraction: 0.05,
	saturatedGrey: 250,
	saturatedFraction: 0.2,
	sdRatio: [0.5, 1.6] as const,
	beneathDb: 3,
	cellsPerBlock: 30,
	neighbourhoodCm: 1,
} as const;

export interface SpeckleMask {
	/** One code per frame pixel (maskCodes); only `speckle` pixels are measured. */
	readonly codes: Uint8Array;
	readonly blockSidePx: number;
	/** Pixels of the measured columns masked for each reason. */
	readonly maskedPx: Readonly<Record<MaskReason, number>>;
}

interface Block {
	readonly r0: number;
	readonly r1: number;
	readonly c0: number;
	readonly c1: number;
	level: number;
	sdDb: number;
	reason: MaskReason;
}

function median(values: number[]): number {
	if (values.length === 0) return Number.NaN;
	const s = [...values].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

function edges(first: number, end: number, side: number): number[] {
	const count = Math.max(1, Math.floor((end - first) / side));
	return Array.from({length: count + 1}, (_, k) => first + Math.round(((end - first) * k) / count));
}

/** Classifies the measured columns of a frame; `cellAreaPx` sets the block size. */
export function maskNonSpeckle(
	frame: GreyFrame,
	region: MeasuredRegion,
	map: LevelMap,
	cellAreaPx: number,
): SpeckleMask {
	const {width, grey, valid} = frame;
	const side = Math.max(4, Math.min(32, Math.ceil(Math.sqrt(maskThresholds.cellsPerBlock * cellAreaPx))));
	const rowEdges = edges(region.rows[0], region.rows[1], side);
	const colEdges = edges(region.columns[0], region.columns[1], side);
	const nRows = rowEdges.length - 1;
	const nCols = colEdges.length - 1;
	const blocks: Block[][] = [];
	for (let i = 0; i < nRows; i++) {
		const line: Block[] = [];
		for (let j = 0; j < nCols; j++) {
			const b: Block = {
				r0: rowEdges[i]!,
				r1: rowEdges[i + 1]!,
				c0: colEdges[j]!,
				c1: colEdges[j + 1]!,
				level: 0,
				sdDb: 0,
				reason: 'speckle',
			};
			let n = 0;
			let total = 0;
			let s = 0;
			let s2 = 0;
			for (let r = b.r0; r < b.r1; r++) {
				for (let c = b.c0; c < b.c1; c++) {
					total++;
					if (valid && !valid[r * width + c]) continue;
					const g = grey[r * width + c]!;
					n++;
					s += g;
					s2 += g * g;
				}
			}
			if (n < total / 2 || n < 2) b.reason = 'notImage';
			else {
				const mean = s / n;
				b.level = map.levelDb(mean);
				b.sdDb = Math.sqrt(Math.max(0, (s2 - n * mean * mean) / (n - 1))) * map.slopeDbPerGrey(mean);
			}
			line.push(b);
		}
		blocks.push(line);
	}

	// Neighbourhood medians of level and SD: the median of the block rows' own medians within ±1 cm
	// of depth (a structure filling part of a few rows does not move it).
	const reach = Math.max(0, Math.round(maskThresholds.neighbourhoodCm / region.cmPerPixel / side));
	const rowLevel: number[] = [];
	const rowSd: number[] = [];
	for (const line of blocks) {
		const speckle = line.filter((b) => b.reason === 'speckle');
		rowLevel.push(median(speckle.map((b) => b.level)));
		rowSd.push(median(speckle.map((b) => b.sdDb)));
	}
	const nearby = (values: number[], i: number) =>
		median(values.slice(Math.max(0, i - reach), Math.min(nRows, i + reach + 1)).filter((v) => !Number.isNaN(v)));
	const refLevel = blocks.map((_, i) => nearby(rowLevel, i));
	const refSd = blocks.map((_, i) => nearby(rowSd, i));

	for (let i = 0; i < nRows; i++) {
		const ref = refLevel[i]!;
		const brightGrey = map.greyAt(ref + maskThresholds.brightPixelDb);
		for (const b of blocks[i]!) {
			if (b.reason !== 'speckle') continue;
			let n = 0;
			let bright = 0;
			let saturated = 0;
			for (let r = b.r0; r < b.r1; r++) {
				for (let c = b.c0; c < b.c1; c++) {
					if (valid && !valid[r * width + c]) continue;
					const g = grey[r * width + c]!;
					n++;
					if (g >= brightGrey) bright++;
					if (g >= maskThresholds.saturatedGrey) saturated++;
				}
			}
			const [lowSd, highSd] = maskThresholds.sdRatio;
			if (b.level <= ref - maskThresholds.levelDb) b.reason = 'anechoic';
			else if (
				b.level >= ref + maskThresholds.levelDb ||
				bright > maskThresholds.brightPixelFraction * n ||
				saturated > maskThresholds.saturatedFraction * n
			)
				b.reason = 'bright';
			else if (b.sdDb < lowSd * refSd[i]! || b.sdDb > highSd * refSd[i]!) b.reason = 'notSpeckle';
		}
	}

	// Partly covered neighbours, then shadows and enhancement beneath structures.
	const structural = (b: Block | undefined) =>
		b !== undefined && (b.reason === 'anechoic' || b.reason === 'bright' || b.reason === 'notSpeckle');
	const flagged = blocks.map((line) => line.map((b) => structural(b)));
	for (let i = 0; i < nRows; i++) {
		for (let j = 0; j < nCols; j++) {
			const b = blocks[i]![j]!;
			if (b.reason !== 'speckle') continue;
			let near = false;
			for (let di = -1; di <= 1 && !near; di++)
				for (let dj = -1; dj <= 1 && !near; dj++) near = flagged[i + di]?.[j + dj] === true;
			if (near) b.reason = 'edge';
		}
	}
	for (let j = 0; j < nCols; j++) {
		let beneath = false;
		for (let i = 0; i < nRows; i++) {
			const b = blocks[i]![j]!;
			if (b.reason === 'anechoic' || b.reason === 'bright') beneath = true;
			else if (beneath && (b.reason === 'speckle' || b.reason === 'edge')) {
				if (Math.abs(b.level - refLevel[i]!) > maskThresholds.beneathDb) b.reason = 'beneath';
				else if (b.reason === 'speckle') beneath = false;
			}
		}
	}

	const codes = new Uint8Array(frame.width * frame.height).fill(maskCodes.outside);
	const maskedPx: Record<MaskReason, number> = {
		speckle: 0,
		notImage: 0,
		anechoic: 0,
		bright: 0,
		notSpeckle: 0,
		edge: 0,
		beneath: 0,
		outside: 0,
	};
	for (const line of blocks) {
		for (const b of line) {
			for (let r = b.r0; r < b.r1; r++) {
				for (let c = b.c0; c < b.c1; c++) {
					const reason: MaskReason = valid && !valid[r * width + c] ? 'notImage' : b.reason;
					codes[r * width + c] = maskCodes[reason];
					maskedPx[reason]++;
				}
			}
		}
	}
	return {codes, blockSidePx: side, maskedPx};
}
