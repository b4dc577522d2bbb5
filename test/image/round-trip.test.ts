/**
 * PNG and DICOM written by src/image read back with independent decoders: fast-png's own decoder
 * and dicom-parser (a second DICOM library, not the dcmjs that wrote them). The region arithmetic
 * is DICOM PS3.3 C.8.5.5: depth of row y = RefPhysValueY + (y − MinY0 − RefPixelY0)·PhysicalDeltaY.
 */
import dicomParser from 'dicom-parser';
import {decode} from 'fast-png';
import {describe, expect, it} from 'vitest';
import {derivedUid, encodeUltrasoundDicom, ultrasoundImageStorage} from '../../src/image/dicom-writer.js';
import {encodePng} from '../../src/image/png-writer.js';
import {greyToRgb} from '../../src/simulate/colour-overlay.js';
import {realisticScanner} from '../../src/simulate/scanner-behaviour.js';
import {simulateFrame} from '../../src/simulate/simulate-frame.js';
import {abdomenPlan} from '../helpers/plans.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';

const plan = resolvePlan(abdomenPlan());
const frame = simulateFrame({plan, scanner: realisticScanner(plan), width: 90, height: 80, seed: 7, caption: 'TEST'});
const cmPerPixel = plan.display.depthCm / 80;

describe('PNG round trip (fast-png decoder)', () => {
	it('8-bit grey: same size, same bytes, the illustration label in a tEXt chunk', () => {
		const bytes = encodePng(
			{width: frame.width, height: frame.height, channels: 1, data: frame.grey},
			{Description: 'Simulated illustration'},
		);
		const back = decode(bytes);
		expect([back.width, back.height, back.channels, back.depth]).toEqual([frame.width, frame.height, 1, 8]);
		expect(Buffer.from(back.data as Uint8Array).equals(Buffer.from(frame.grey))).toBe(true);
		expect(back.text['Description']).toBe('Simulated illustration');
	});

	it('8-bit RGB: tissue stays grey, burned-in text is coloured', () => {
		const rgb = greyToRgb(frame.grey, frame.overlay);
		const back = decode(encodePng({width: frame.width, height: frame.height, channels: 3, data: rgb}));
		expect(back.channels).toBe(3);
		expect(Buffer.from(back.data as Uint8Array).equals(Buffer.from(rgb))).toBe(true);
		const centre = ((frame.region.y0 + 40) * frame.width + frame.region.x0 + 45) * 3;
		expect(rgb[centre]).toBe(rgb[centre + 1]);
		expect(rgb[centre + 1]).toBe(rgb[centre + 2]);
	});
});

describe('DICOM round trip (written by dcmjs, read by dicom-parser)', () => {
	for (const channels of [1, 3] as const) {
		it(`Ultrasound Image Storage, ${channels === 1 ? 'MONOCHROME2' : 'RGB'}, with the region giving the depth scale`, () => {
			const data = channels === 1 ? frame.grey : greyToRgb(frame.grey, frame.overlay);
			const bytes = encodeUltrasoundDicom({
				image: {width: frame.width, height: frame.height, channels, data},
				region: {...frame.region, cmPerPixel, centerMhz: 3.5},
				studyUid: derivedUid('study', 1),
				seriesUid: derivedUid('series', 1),
				instanceUid: derivedUid('image', channels),
				instanceNumber: 1,
				seriesDescription: 'test',
				comments: 'Simulated illustration',
			});
			const ds = dicomParser.parseDicom(bytes);
			expect(ds.string('x00020010')).toBe('1.2.840.10008.1.2.1');
			expect(ds.string('x00080016')).toBe(ultrasoundImageStorage);
			expect(ds.string('x00080060')).toBe('US');
			expect(ds.uint16('x00280010')).toBe(frame.height);
			expect(ds.uint16('x00280011')).toBe(frame.width);
			expect(ds.uint16('x00280002')).toBe(channels);
			expect(ds.string('x00280004')).toBe(channels === 1 ? 'MONOCHROME2' : 'RGB');
			if (channels === 3) expect(ds.uint16('x00280006')).toBe(0);
			const pixel = ds.elements['x7fe00010']!;
			const pixels = bytes.subarray(pixel.dataOffset, pixel.dataOffset + frame.width * frame.height * channels);
			expect(Buffer.from(pixels).equals(Buffer.from(data))).toBe(true);

			const regions = ds.elements['x00186011']!.items!;
			expect(regions).toHaveLength(1);
			const r = regions[0]!.dataSet!;
			expect(r.uint16('x00186012')).toBe(1); // 2-D
			expect(r.uint16('x00186014')).toBe(1); // tissue
			expect([r.uint32('x00186018'), r.uint32('x0018601a'), r.uint32('x0018601c'), r.uint32('x0018601e')]).toEqual([
				frame.region.x0,
				frame.region.y0,
				frame.region.x1,
				frame.region.y1,
			]);
			expect([r.uint16('x00186024'), r.uint16('x00186026')]).toEqual([3, 3]); // cm
			expect(r.double('x0018602e')).toBeCloseTo(cmPerPixel, 12);
			expect(r.double('x0018602c')).toBeCloseTo(cmPerPixel, 12);
			// C.8.5.5 arithmetic: the region's top row is the skin, its last row the display depth less one pixel.
			const depthOfRow = (y: number) =>
				r.double('x0018602a')! + (y - r.uint32('x0018601a')! - r.int32('x00186022')!) * r.double('x0018602e')!;
			expect(depthOfRow(frame.region.y0)).toBeCloseTo(0, 12);
			expect(depthOfRow(frame.region.y1 + 1)).toBeCloseTo(plan.display.depthCm, 9);
			// And it agrees with the simulator's own row → depth map of the whole picture.
			expect(depthOfRow(37)).toBeCloseTo(frame.rowsToDepth.topRowCm + 37 * frame.rowsToDepth.cmPerRow, 9);
		});
	}

	it('same inputs, same bytes (derived UIDs, fixed dates)', () => {
		const make = () =>
			encodeUltrasoundDicom({
				image: {width: 4, height: 3, channels: 1, data: new Uint8Array(12).fill(9)},
				region: {x0: 0, y0: 0, x1: 3, y1: 2, cmPerPixel: 0.1, centerMhz: 5},
				studyUid: derivedUid('a'),
				seriesUid: derivedUid('b'),
				instanceUid: derivedUid('c'),
				instanceNumber: 1,
				seriesDescription: 's',
				comments: 'c',
			});
		expect(Buffer.from(make()).equals(Buffer.from(make()))).toBe(true);
		expect(derivedUid('x')).toMatch(/^2\.25\.\d{1,39}$/);
	});
});
