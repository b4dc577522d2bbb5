/**
 * The depth scale of a DICOM ultrasound still, from its Sequence of Ultrasound Regions
 * (DICOM PS3.3 C.8.5.5, US Region Calibration module). Only a 2-D tissue region (Region Spatial
 * Format 1, Region Data Type 1) with centimetre units is used; anything else is refused by name,
 * never guessed.
 *
 * Depth of image row y (0-based): d = RefPhysValueY + (y − MinY0 − RefPixelY0) · PhysicalDeltaY.
 */
import type {DataSet} from 'dicom-parser';
import type {PixelRect} from '../calibration/phantom-image.js';
import {ImageRefusal} from './image-refusal.js';

export const regionSequenceField = '(0018,6011) Sequence of Ultrasound Regions';

/** Physical Units code for centimetres (PS3.3 C.8.5.5.1.15). */
const unitsCm = 3;
/** Region Spatial Format 2-D and Region Data Type tissue (PS3.3 C.8.5.5.1.1, .1.2). */
const spatialFormat2d = 1;
const dataTypeTissue = 1;
/** PhysicalDeltaX may differ from PhysicalDeltaY by this fraction before the pixels count as non-square. */
const squarePixelTolerance = 0.05;

export interface TissueRegion {
	readonly rect: PixelRect;
	/** Displayed depth of row y = originCm + y·cmPerRow. */
	readonly originCm: number;
	readonly cmPerRow: number;
	readonly cmPerColumn: number;
	/** Other 2-D tissue regions present and not used (the largest one is measured). */
	readonly othersIgnored: number;
}

const tags = {
	spatialFormat: ['x00186012', 'Region Spatial Format'],
	dataType: ['x00186014', 'Region Data Type'],
	minX0: ['x00186018', 'Region Location Min X0'],
	minY0: ['x0018601a', 'Region Location Min Y0'],
	maxX1: ['x0018601c', 'Region Location Max X1'],
	maxY1: ['x0018601e', 'Region Location Max Y1'],
	refX0: ['x00186020', 'Reference Pixel X0'],
	refY0: ['x00186022', 'Reference Pixel Y0'],
	unitsX: ['x00186024', 'Physical Units X Direction'],
	unitsY: ['x00186026', 'Physical Units Y Direction'],
	refValueY: ['x0018602a', 'Reference Pixel Physical Value Y'],
	deltaX: ['x0018602c', 'Physical Delta X'],
	deltaY: ['x0018602e', 'Physical Delta Y'],
} as const;

type TagKey = keyof typeof tags;

function fieldName(key: TagKey): string {
	const [tag, name] = tags[key];
	return `${regionSequenceField} › (${tag.slice(1, 5).toUpperCase()},${tag.slice(5).toUpperCase()}) ${name}`;
}

function required(key: TagKey, read: (tag: string) => number | undefined): number {
	const value = read(tags[key][0]);
	if (value === undefined || !Number.isFinite(value))
		throw new ImageRefusal(fieldName(key), 'is missing from the tissue region');
	return value;
}

/** Whether the file carries any region sequence at all. */
export function hasRegionSequence(dataSet: DataSet): boolean {
	const items = dataSet.elements['x00186011']?.items;
	return Array.isArray(items) && items.length > 0;
}

/**
 * Picks the 2-D tissue region and checks it against the pixel matrix. Throws ImageRefusal naming
 * the attribute when there is none or it does not fit.
 */
export function tissueRegion(dataSet: DataSet, columns: number, rows: number): TissueRegion {
	const items = dataSet.elements['x00186011']?.items ?? [];
	const candidates = items
		.map((item) => item.dataSet)
		.filter((d): d is DataSet => d !== undefined)
		.filter(
			(d) => d.uint16(tags.spatialFormat[0]) === spatialFormat2d && d.uint16(tags.dataType[0]) === dataTypeTissue,
		);
	if (!candidates.length) {
		throw new ImageRefusal(
			regionSequenceField,
			items.length
				? 'has no 2-D tissue region (Region Spatial Format 1 with Region Data Type 1)'
				: 'is missing; give a calibrated still or pixelScale in the session',
		);
	}
	const measured = candidates.map((d) => {
		const u32 = (t: string) => d.uint32(t);
		const rect = {
			x0: required('minX0', u32),
			y0: required('minY0', u32),
			x1: required('maxX1', u32),
			y1: required('maxY1', u32),
		};
		return {d, rect, area: Math.max(0, rect.x1 - rect.x0 + 1) * Math.max(0, rect.y1 - rect.y0 + 1)};
	});
	measured.sort((a, b) => b.area - a.area);
	const {d, rect} = measured[0]!;
	const within = `the pixel matrix is ${columns} × ${rows} (Columns × Rows)`;
	if (rect.x1 < rect.x0 || rect.x1 >= columns) {
		throw new ImageRefusal(
			fieldName('maxX1'),
			`is ${rect.x1} with Min X0 ${rect.x0}; the region must lie inside the image, and ${within}`,
		);
	}
	if (rect.y1 < rect.y0 || rect.y1 >= rows) {
		throw new ImageRefusal(
			fieldName('maxY1'),
			`is ${rect.y1} with Min Y0 ${rect.y0}; the region must lie inside the image, and ${within}`,
		);
	}
	const unitsY = required('unitsY', (t) => d.uint16(t));
	if (unitsY !== unitsCm) throw new ImageRefusal(fieldName('unitsY'), `is ${unitsY}; depth needs 3 (cm)`);
	const unitsX = required('unitsX', (t) => d.uint16(t));
	if (unitsX !== unitsCm) throw new ImageRefusal(fieldName('unitsX'), `is ${unitsX}; a 2-D tissue region needs 3 (cm)`);
	const deltaY = required('deltaY', (t) => d.double(t));
	if (!(deltaY > 0)) throw new ImageRefusal(fieldName('deltaY'), `is ${deltaY}; must be above 0 cm per pixel`);
	const deltaX = required('deltaX', (t) => d.double(t));
	if (!(deltaX > 0)) throw new ImageRefusal(fieldName('deltaX'), `is ${deltaX}; must be above 0 cm per pixel`);
	if (Math.abs(Math.abs(deltaX) / deltaY - 1) > squarePixelTolerance) {
		throw new ImageRefusal(
			fieldName('deltaX'),
			`is ${deltaX} cm against Physical Delta Y ${deltaY} cm; pixels must be square within 5 %`,
		);
	}
	const refY0 = required('refY0', (t) => d.int32(t));
	// Absent reference values mean the origin sits at the reference pixel (value 0).
	const refValueY = d.double(tags.refValueY[0]) ?? 0;
	return {
		rect,
		originCm: refValueY + (-rect.y0 - refY0) * deltaY,
		cmPerRow: deltaY,
		cmPerColumn: Math.abs(deltaX),
		othersIgnored: candidates.length - 1,
	};
}
