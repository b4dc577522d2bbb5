/**
 * The image readers' decoded still (src/image) as the analysis sees it: a grey frame, the valid
 * pixels, the measured columns and the depth of each row. Described structurally so this folder
 * stays free of the readers.
 */
import type {GreyFrame, MeasuredRegion} from './grey-frame.js';

export interface DecodedStill {
	readonly width: number;
	readonly height: number;
	readonly grey: ArrayLike<number>;
	/** 1 where a pixel must not be measured (colour). */
	readonly mask: ArrayLike<number>;
	/** The image region, inclusive pixel rectangle. */
	readonly region: {readonly x0: number; readonly y0: number; readonly x1: number; readonly y1: number};
	/** Displayed depth of the centre of row y = originCm + y·cmPerRow. */
	readonly rows: {readonly originCm: number; readonly cmPerRow: number};
	readonly depthScaleFrom: string;
}

/** Lateral fraction of the region measured: the central columns, where sector images are near vertical. */
export const measuredColumns = [0.3, 0.7] as const;

export function frameFromImage(image: DecodedStill): {frame: GreyFrame; region: MeasuredRegion; depthScale: string} {
	const valid = new Uint8Array(image.width * image.height);
	for (let i = 0; i < valid.length; i++) valid[i] = image.mask[i] ? 0 : 1;
	const {x0, x1, y0, y1} = image.region;
	const w = x1 - x0 + 1;
	const region: MeasuredRegion = {
		columns: [x0 + Math.round(measuredColumns[0] * w), x0 + Math.round(measuredColumns[1] * w)],
		rows: [y0, y1 + 1],
		topRowCm: image.rows.originCm - 0.5 * image.rows.cmPerRow,
		cmPerPixel: image.rows.cmPerRow,
	};
	const depthScale =
		image.depthScaleFrom === 'ultrasound-region' ? 'the DICOM ultrasound region' : 'the pixel scale given';
	return {frame: {width: image.width, height: image.height, grey: image.grey, valid}, region, depthScale};
}
