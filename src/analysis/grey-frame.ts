/**
 * The image analysis works on one decoded grey frame and a row → depth scale; how the frame was read
 * (DICOM, PNG) is the image reader's business, not this folder's.
 */

/** One frame as luma grey values 0–255, row-major. */
export interface GreyFrame {
	readonly width: number;
	readonly height: number;
	/** Luma, 0–255, `width·height` values, row 0 at the top (skin side). */
	readonly grey: ArrayLike<number>;
	/** Optional: 0 marks a pixel that is not image data (colour overlay, burned-in text, outside the region). */
	readonly valid?: ArrayLike<number>;
}

/** Where the measured part of the frame lies, and the depth of its rows. */
export interface MeasuredRegion {
	/** First and one-past-last pixel column measured. */
	readonly columns: readonly [first: number, end: number];
	/** First and one-past-last pixel row of the image region (rows outside are never read). */
	readonly rows: readonly [first: number, end: number];
	/** Displayed depth of the top edge of row 0, cm (may be negative when the region starts lower). */
	readonly topRowCm: number;
	/** Displayed cm per pixel row. */
	readonly cmPerPixel: number;
}

/** Displayed depth of the centre of pixel row `row`, cm. */
export function rowDepthCm(region: MeasuredRegion, row: number): number {
	return region.topRowCm + (row + 0.5) * region.cmPerPixel;
}

/** Displayed depth of the bottom edge of the region's last row, cm. */
export function regionBottomCm(region: MeasuredRegion): number {
	return region.topRowCm + region.rows[1] * region.cmPerPixel;
}
