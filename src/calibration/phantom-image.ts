/**
 * One decoded still as the calibration sees it: luma grey levels, which pixels to ignore, the
 * rectangle to measure and how rows map to displayed depth. The readers in src/image produce it;
 * everything in this folder only reads it (pure: no file, process or terminal access).
 */

/** A pixel rectangle, inclusive on both ends, 0-based. */
export interface PixelRect {
	readonly x0: number;
	readonly y0: number;
	readonly x1: number;
	readonly y1: number;
}

export interface PhantomImage {
	readonly width: number;
	readonly height: number;
	/** Luma 0–255 (0.299R + 0.587G + 0.114B for colour), row-major. */
	readonly grey: Float32Array;
	/** 1 where a pixel is not grey (colour overlay, coloured text) and must not be measured. */
	readonly mask: Uint8Array;
	/** The image region to measure: the DICOM ultrasound tissue region, or the whole PNG. */
	readonly region: PixelRect;
	/** Displayed depth of the centre of row y = originCm + y·cmPerRow. */
	readonly rows: {readonly originCm: number; readonly cmPerRow: number};
	/** Lateral pixel size, cm, when known (DICOM PhysicalDeltaX; PNG cmPerPixel). */
	readonly cmPerColumn: number | null;
	/** Where the depth scale came from, for the report. */
	readonly depthScaleFrom: 'ultrasound-region' | 'pixel-scale';
	/** Short remarks worth passing on (colour pixels masked, frame used, …). */
	readonly notes: readonly string[];
}

/** Displayed depth of a row's centre, cm. */
export function rowDepthCm(image: PhantomImage, y: number): number {
	return image.rows.originCm + y * image.rows.cmPerRow;
}
