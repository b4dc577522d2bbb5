/**
 * The DICOM reader against files written by an independent writer (dcmjs 0.51.1) and read back
 * both by the project's reader and, for the region arithmetic, by dicom-parser directly.
 */
import dicomParser from 'dicom-parser';
import jpeg from 'jpeg-js';
import {describe, expect, it} from 'vitest';
import {rowDepthCm} from '../../src/calibration/phantom-image.js';
import {ImageRefusal} from '../../src/image/image-refusal.js';
import {decodeImage} from '../../src/image/read-image.js';
import {syntaxes, withDefinedLengthRegions, writeDicom, type RegionFixture} from '../helpers/dicom-fixture.js';
import {thrown} from '../helpers/thrown.js';

const rows = 160;
const columns = 64;
/** Shared reference case C42 (DICOM PS3.3 C.8.5.5 arithmetic): MinY0 20, RefPixelY0 0, value 0, ΔY 0.05. */
const c42: RegionFixture = {minX0: 4, minY0: 20, maxX1: 59, maxY1: 150, deltaY: 0.05};

function ramp(n: number, f: (i: number) => number): Uint8Array {
	return Uint8Array.from({length: n}, (_, i) => f(i));
}

const grey = ramp(rows * columns, (i) => Math.floor(i / columns) % 256);

const refusal = (fn: () => unknown) => thrown(ImageRefusal, fn);

describe('DICOM ultrasound region → displayed depth', () => {
	it('row 120 with MinY0 20, ΔY 0.05 cm is 5.00 cm (case C42), read by our reader and by dicom-parser alone', () => {
		const file = writeDicom({rows, columns, pixels: grey, regions: [c42]});
		const image = decodeImage(file, {label: 'c42.dcm'});
		expect(image.depthScaleFrom).toBe('ultrasound-region');
		expect(image.region).toEqual({x0: 4, y0: 20, x1: 59, y1: 150});
		expect(rowDepthCm(image, 120)).toBeCloseTo(5.0, 10);
		// Independently: the attributes as dicom-parser reads them, through the PS3.3 formula.
		const ds = dicomParser.parseDicom(file);
		const item = ds.elements['x00186011']!.items![0]!.dataSet!;
		const depth =
			item.double('x0018602a')! +
			(120 - item.uint32('x0018601a')! - item.int32('x00186022')!) * item.double('x0018602e')!;
		expect(depth).toBeCloseTo(5.0, 10);
		expect(image.grey[120 * columns + 10]).toBe(120);
	});

	it('reads the same region from a sequence of defined length', () => {
		const undefinedLength = writeDicom({
			rows,
			columns,
			pixels: grey,
			regions: [{...c42, refPixelY0: 10, refValueY: 0.5}],
		});
		const defined = withDefinedLengthRegions(undefinedLength);
		expect(dicomParser.parseDicom(defined).elements['x00186011']!.hadUndefinedLength).toBeFalsy();
		const a = decodeImage(undefinedLength);
		const b = decodeImage(defined);
		expect(b.rows).toEqual(a.rows);
		// 0.5 + (120 − 20 − 10)·0.05 = 5.0 cm
		expect(rowDepthCm(b, 120)).toBeCloseTo(5.0, 10);
	});

	it('uses the largest 2-D tissue region and ignores colour-flow and graphics regions', () => {
		const file = writeDicom({
			rows,
			columns,
			pixels: grey,
			regions: [
				{minX0: 0, minY0: 0, maxX1: 63, maxY1: 10, deltaY: 0.1, dataType: 2},
				c42,
				{minX0: 0, minY0: 152, maxX1: 10, maxY1: 159, deltaY: 0.05},
			],
		});
		const image = decodeImage(file);
		expect(image.region.y0).toBe(20);
		expect(image.notes.join(' ')).toContain('largest');
	});

	it('refuses a region outside the pixel matrix, naming the attribute (shared reference C42)', () => {
		const file = writeDicom({rows, columns, pixels: grey, regions: [{...c42, maxY1: rows}]});
		const e = refusal(() => decodeImage(file));
		expect(e.message).toContain('(0018,601E) Region Location Max Y1');
		expect(e.message).toContain('inside the image');
	});

	it('refuses a region in other units or with non-square pixels, and one with no tissue region', () => {
		expect(
			refusal(() => decodeImage(writeDicom({rows, columns, pixels: grey, regions: [{...c42, unitsY: 4}]}))).message,
		).toContain('Physical Units Y Direction');
		expect(
			refusal(() => decodeImage(writeDicom({rows, columns, pixels: grey, regions: [{...c42, deltaX: 0.08}]}))).message,
		).toContain('Physical Delta X');
		expect(
			refusal(() => decodeImage(writeDicom({rows, columns, pixels: grey, regions: [{...c42, dataType: 3}]}))).message,
		).toContain('no 2-D tissue region');
	});

	it('with no regions: refused without pixelScale, measured whole with it', () => {
		const file = writeDicom({rows, columns, pixels: grey});
		expect(refusal(() => decodeImage(file, {label: 'bare.dcm'})).message).toMatch(
			/bare\.dcm: \(0018,6011\).*pixelScale/,
		);
		const image = decodeImage(file, {pixelScale: {cmPerPixel: 0.1, topRowCm: 1}});
		expect(image.region).toEqual({x0: 0, y0: 0, x1: columns - 1, y1: rows - 1});
		expect(rowDepthCm(image, 0)).toBeCloseTo(1.05, 10);
	});
});

describe('DICOM pixel data', () => {
	it('MONOCHROME1 is inverted; implicit VR little endian reads the same', () => {
		const m1 = decodeImage(writeDicom({rows, columns, pixels: grey, photometric: 'MONOCHROME1', regions: [c42]}));
		expect(m1.grey[120 * columns]).toBe(255 - 120);
		const implicit = decodeImage(
			writeDicom({rows, columns, pixels: grey, regions: [c42], syntax: syntaxes.implicitLittle}),
		);
		expect(implicit.grey[77 * columns + 3]).toBe(77);
		expect(rowDepthCm(implicit, 120)).toBeCloseTo(5.0, 10);
	});

	it('16-bit MONOCHROME2 is scaled to 0–255', () => {
		const words = new Uint16Array(rows * columns).map((_, i) => (i % 2 ? 65535 : 0));
		const image = decodeImage(
			writeDicom({rows, columns, pixels: new Uint8Array(words.buffer), bitsAllocated: 16, regions: [c42]}),
		);
		expect(image.grey[0]).toBe(0);
		expect(image.grey[1]).toBeCloseTo(255, 6);
	});

	it('RGB in both planar configurations: luma 0.299R + 0.587G + 0.114B, coloured pixels masked and widened', () => {
		const n = rows * columns;
		const rgb = (i: number): [number, number, number] => {
			const x = i % columns;
			const y = Math.floor(i / columns);
			return x >= 30 && x < 34 && y >= 60 && y < 64 ? [250, 20, 20] : [y % 256, y % 256, y % 256];
		};
		const interleaved = new Uint8Array(3 * n);
		const planar = new Uint8Array(3 * n);
		for (let i = 0; i < n; i++) {
			const p = rgb(i);
			for (let c = 0; c < 3; c++) {
				interleaved[3 * i + c] = p[c]!;
				planar[c * n + i] = p[c]!;
			}
		}
		for (const [pixels, pc] of [
			[interleaved, 0],
			[planar, 1],
		] as const) {
			const image = decodeImage(
				writeDicom({rows, columns, pixels, photometric: 'RGB', samples: 3, planar: pc, regions: [c42]}),
			);
			expect(image.grey[100 * columns + 5]).toBeCloseTo(100, 4);
			expect(image.grey[61 * columns + 31]).toBeCloseTo(0.299 * 250 + 0.587 * 20 + 0.114 * 20, 3);
			expect(image.mask[61 * columns + 31]).toBe(1);
			expect(image.mask[61 * columns + 28]).toBe(1); // widened by 2 px
			expect(image.mask[61 * columns + 27]).toBe(0);
			expect(image.notes.join(' ')).toContain('16 coloured pixels masked');
		}
	});

	it('YBR_FULL and YBR_FULL_422 give Y as luma', () => {
		const n = rows * columns;
		const full = new Uint8Array(3 * n);
		for (let i = 0; i < n; i++) full.set([Math.floor(i / columns) % 256, 128, 128], 3 * i);
		const a = decodeImage(
			writeDicom({rows, columns, pixels: full, photometric: 'YBR_FULL', samples: 3, planar: 0, regions: [c42]}),
		);
		expect(a.grey[90 * columns + 7]).toBeCloseTo(90, 3);
		const half = new Uint8Array(2 * n);
		for (let p = 0; p < n / 2; p++) {
			const y = Math.floor((2 * p) / columns) % 256;
			half.set([y, y, 128, 128], 4 * p);
		}
		const b = decodeImage(
			writeDicom({rows, columns, pixels: half, photometric: 'YBR_FULL_422', samples: 3, planar: 0, regions: [c42]}),
		);
		expect(b.grey[90 * columns + 7]).toBeCloseTo(90, 3);
		expect(b.mask.every((m) => m === 0)).toBe(true);
	});

	it('PALETTE COLOR through 16-bit tables (entries shifted right by 8)', () => {
		const entries = 256;
		const table = new Uint16Array(entries).map((_, k) => (255 - k) * 257);
		const tableBytes = new Uint8Array(table.buffer);
		const image = decodeImage(
			writeDicom({
				rows,
				columns,
				pixels: grey,
				photometric: 'PALETTE COLOR',
				regions: [c42],
				vrMap: {
					RedPaletteColorLookupTableDescriptor: 'US',
					GreenPaletteColorLookupTableDescriptor: 'US',
					BluePaletteColorLookupTableDescriptor: 'US',
				},
				extra: {
					RedPaletteColorLookupTableDescriptor: [entries, 0, 16],
					GreenPaletteColorLookupTableDescriptor: [entries, 0, 16],
					BluePaletteColorLookupTableDescriptor: [entries, 0, 16],
					RedPaletteColorLookupTableData: tableBytes.buffer.slice(0),
					GreenPaletteColorLookupTableData: tableBytes.buffer.slice(0),
					BluePaletteColorLookupTableData: tableBytes.buffer.slice(0),
				},
			}),
		);
		expect(image.grey[40 * columns]).toBeCloseTo(215, 3);
	});

	it('one frame of a multi-frame file, chosen by number; none chosen is refused by attribute', () => {
		const frames = 3;
		const pixels = new Uint8Array(frames * rows * columns).map((_, i) => Math.floor(i / (rows * columns)) * 50 + 10);
		const file = writeDicom({rows, columns, pixels, frames, regions: [c42]});
		expect(decodeImage(file, {frame: 2}).grey[500]).toBe(60);
		expect(refusal(() => decodeImage(file)).message).toContain('(0028,0008) Number of Frames: is 3');
		expect(refusal(() => decodeImage(file, {frame: 4})).message).toContain('from 1 to 3');
	});

	it('JPEG baseline (YBR_FULL_422, several fragments) decodes to luma within JPEG error', () => {
		// 8 × 8 blocks of scattered levels, aligned with JPEG's blocks: large enough for several fragments.
		const w = 512;
		const h = 400;
		const level = (i: number) =>
			40 + ((Math.floor((i % w) / 8) * 37 + Math.floor(i / w / 8) * 91) % 150) + ((i * 2654435761) >>> 28);
		const rgba = new Uint8Array(w * h * 4);
		for (let i = 0; i < w * h; i++) rgba.set([level(i), level(i), level(i), 255], 4 * i);
		const stream = new Uint8Array(jpeg.encode({width: w, height: h, data: rgba}, 95).data);
		const file = writeDicom({
			rows: h,
			columns: w,
			pixels: [stream],
			photometric: 'YBR_FULL_422',
			samples: 3,
			planar: 0,
			syntax: syntaxes.jpegBaseline,
			regions: [{minX0: 0, minY0: 0, maxX1: w - 1, maxY1: h - 1, deltaY: 0.05}],
		});
		const el = dicomParser.parseDicom(file).elements['x7fe00010']!;
		expect(el.fragments!.length).toBeGreaterThan(1);
		const image = decodeImage(file);
		let error = 0;
		for (let i = 0; i < w * h; i++) error += Math.abs(image.grey[i]! - level(i));
		expect(error / (w * h)).toBeLessThan(3);
		expect(image.mask.every((m) => m === 0)).toBe(true);
	});

	it('JPEG with Photometric Interpretation RGB is decoded without a colour transform (shared reference C44)', () => {
		// jpeg-js's encoder always writes YCbCr; pre-distorting grey v by the inverse transform makes the stored
		// components (v, v, v), i.e. an RGB-coded JPEG. Decoded with the default transform it would turn coloured.
		const w = 64;
		const h = 64;
		const rgba = new Uint8Array(w * h * 4);
		for (let i = 0; i < w * h; i++) {
			const v = 100 + (i % 56);
			const c = v - 128;
			rgba.set(
				[v + 1.402 * c, v - 0.344136 * c - 0.714136 * c, v + 1.772 * c, 255].map((x) =>
					Math.max(0, Math.min(255, Math.round(x))),
				),
				4 * i,
			);
		}
		const stream = new Uint8Array(jpeg.encode({width: w, height: h, data: rgba}, 100).data);
		const file = writeDicom({
			rows: h,
			columns: w,
			pixels: [stream],
			photometric: 'RGB',
			samples: 3,
			planar: 0,
			syntax: syntaxes.jpegBaseline,
			regions: [{minX0: 0, minY0: 0, maxX1: w - 1, maxY1: h - 1, deltaY: 0.05}],
		});
		const image = decodeImage(file);
		let masked = 0;
		let err = 0;
		for (let i = 0; i < w * h; i++) {
			masked += image.mask[i]!;
			err += Math.abs(image.grey[i]! - (100 + (i % 56)));
		}
		expect(masked).toBe(0);
		expect(err / (w * h)).toBeLessThan(3);
	});
});

describe('DICOM refusals name the attribute', () => {
	it('a truncated file', () => {
		const file = writeDicom({rows, columns, pixels: grey, regions: [c42]});
		const e = refusal(() => decodeImage(file.subarray(0, file.length - 4000), {label: 'cut.dcm'}));
		expect(e.message).toMatch(/cut\.dcm: .*(truncated|Pixel Data)/);
	});

	it('an unsupported transfer syntax, said by UID and name', () => {
		const file = writeDicom({
			rows,
			columns,
			pixels: [new Uint8Array([0xff, 0x4f, 0xff, 0x51])],
			syntax: syntaxes.jpeg2000,
			regions: [c42],
		});
		expect(refusal(() => decodeImage(file)).message).toContain(
			'(0002,0010) Transfer Syntax UID: is 1.2.840.10008.1.2.4.91 (JPEG 2000)',
		);
	});

	it('a size claim over 8192 px a side, before any pixel is decoded', () => {
		const file = writeDicom({rows: 9000, columns: 16, pixels: new Uint8Array(16), regions: [c42]});
		expect(refusal(() => decodeImage(file)).message).toContain(
			'(0028,0010) Rows: is 9000; images up to 8192 pixels a side',
		);
	});

	it('not DICOM and not PNG', () => {
		expect(refusal(() => decodeImage(new TextEncoder().encode('hello'), {label: 'note.txt'})).message).toContain(
			'note.txt: is neither',
		);
	});
});
