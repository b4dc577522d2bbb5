/**
 * DICOM Part 10 stills (Ultrasound Image Storage, Secondary Capture, one frame of a multi-frame
 * file): dataset by dicom-parser, JPEG baseline by jpeg-js, native pixels decoded here.
 * Photometric interpretations: MONOCHROME1/2, RGB (planar 0 or 1), YBR_FULL, YBR_FULL_422 and
 * PALETTE COLOR (DICOM PS3.3 C.7.6.3). Every refusal names the attribute.
 */
import dicomParser, {type DataSet, type Element} from 'dicom-parser';
import jpeg from 'jpeg-js';
import type {PhantomImage} from '../calibration/phantom-image.js';
import {hasRegionSequence, tissueRegion} from './dicom-regions.js';
import {greyFromInterleavedRgb, greyFromMonochrome, greyFromRgb, ybrToRgb, type GreyPlane} from './grey-levels.js';
import {ImageRefusal, imageLimits} from './image-refusal.js';
import type {PixelScale} from './png-image.js';

export interface DicomReadOptions {
	/** Frame to read, 1-based; required when the file holds more than one. */
	readonly frame?: number;
	/** Used only when the file has no Sequence of Ultrasound Regions. */
	readonly pixelScale?: PixelScale;
}

const nativeSyntaxes: Record<string, string> = {
	'1.2.840.10008.1.2': 'Implicit VR Little Endian',
	'1.2.840.10008.1.2.1': 'Explicit VR Little Endian',
	'1.2.840.10008.1.2.2': 'Explicit VR Big Endian',
};
const jpegBaseline = '1.2.840.10008.1.2.4.50';
/** Syntaxes named in refusals, so the user learns what the file is (PS3.6 Annex A). */
const knownOthers: Record<string, string> = {
	'1.2.840.10008.1.2.1.99': 'Deflated Explicit VR Little Endian',
	'1.2.840.10008.1.2.4.51': 'JPEG Extended (12-bit)',
	'1.2.840.10008.1.2.4.57': 'JPEG Lossless',
	'1.2.840.10008.1.2.4.70': 'JPEG Lossless, first-order prediction',
	'1.2.840.10008.1.2.4.80': 'JPEG-LS Lossless',
	'1.2.840.10008.1.2.4.81': 'JPEG-LS Near-Lossless',
	'1.2.840.10008.1.2.4.90': 'JPEG 2000 Lossless',
	'1.2.840.10008.1.2.4.91': 'JPEG 2000',
	'1.2.840.10008.1.2.4.100': 'MPEG2 video',
	'1.2.840.10008.1.2.4.101': 'MPEG2 video',
	'1.2.840.10008.1.2.4.102': 'MPEG-4 AVC/H.264 video',
	'1.2.840.10008.1.2.4.103': 'MPEG-4 AVC/H.264 video',
	'1.2.840.10008.1.2.4.104': 'MPEG-4 AVC/H.264 video',
	'1.2.840.10008.1.2.4.105': 'MPEG-4 AVC/H.264 video',
	'1.2.840.10008.1.2.4.106': 'MPEG-4 AVC/H.264 video',
	'1.2.840.10008.1.2.4.107': 'HEVC/H.265 video',
	'1.2.840.10008.1.2.4.108': 'HEVC/H.265 video',
	'1.2.840.10008.1.2.5': 'RLE Lossless',
};

const field = {
	syntax: '(0002,0010) Transfer Syntax UID',
	rows: '(0028,0010) Rows',
	columns: '(0028,0011) Columns',
	samples: '(0028,0002) Samples per Pixel',
	photometric: '(0028,0004) Photometric Interpretation',
	bitsAllocated: '(0028,0100) Bits Allocated',
	bitsStored: '(0028,0101) Bits Stored',
	planar: '(0028,0006) Planar Configuration',
	frames: '(0028,0008) Number of Frames',
	pixelData: '(7FE0,0010) Pixel Data',
	palette: '(0028,1101) Red Palette Color Lookup Table Descriptor',
} as const;

function parse(bytes: Uint8Array, label: string): DataSet {
	try {
		return dicomParser.parseDicom(bytes);
	} catch (error) {
		const text =
			typeof error === 'string'
				? error
				: ((error as {exception?: string})?.exception ?? (error as Error)?.message ?? 'unreadable');
		throw new ImageRefusal(
			label,
			`is not a readable DICOM Part 10 file, or is truncated (${String(text).slice(0, 160)})`,
		);
	}
}

function requireUint16(ds: DataSet, tag: string, name: string): number {
	const v = ds.uint16(tag);
	if (v === undefined) throw new ImageRefusal(name, 'is missing');
	return v;
}

export function readDicomImage(bytes: Uint8Array, label: string, options: DicomReadOptions = {}): PhantomImage {
	const ds = parse(bytes, label);
	const at = (name: string) => `${label}: ${name}`;
	const syntax = (ds.string('x00020010') ?? '').replace(/\0/g, '').trim();
	const isJpeg = syntax === jpegBaseline;
	if (!isJpeg && !nativeSyntaxes[syntax]) {
		const known = knownOthers[syntax];
		const what = known ? `${syntax} (${known})` : syntax || '(empty)';
		const hint = known?.includes('video')
			? 'video has no decoder here: export a still image'
			: 'export as uncompressed or JPEG baseline (1.2.840.10008.1.2.4.50)';
		throw new ImageRefusal(at(field.syntax), `is ${what}, which evenecho cannot decode; ${hint}`);
	}
	const rows = requireUint16(ds, 'x00280010', at(field.rows));
	const columns = requireUint16(ds, 'x00280011', at(field.columns));
	for (const [n, name] of [
		[rows, field.rows],
		[columns, field.columns],
	] as const) {
		if (n < 1 || n > imageLimits.maxSidePx)
			throw new ImageRefusal(at(name), `is ${n}; images up to ${imageLimits.maxSidePx} pixels a side are read`);
	}
	const samples = ds.uint16('x00280002') ?? 1;
	const photometric = (ds.string('x00280004') ?? '').trim().toUpperCase();
	const bitsAllocated = ds.uint16('x00280100') ?? 8;
	const bitsStored = ds.uint16('x00280101') ?? bitsAllocated;
	const frames = Math.max(1, Number.parseInt(ds.string('x00280008') ?? '1', 10) || 1);
	let frameIndex = 0;
	if (options.frame !== undefined) {
		if (!Number.isInteger(options.frame) || options.frame < 1 || options.frame > frames) {
			throw new ImageRefusal(
				at(field.frames),
				`is ${frames}; the frame chosen (${options.frame}) must be a whole number from 1 to ${frames}`,
			);
		}
		frameIndex = options.frame - 1;
	} else if (frames > 1) {
		throw new ImageRefusal(
			at(field.frames),
			`is ${frames}; choose one frame (from 1 to ${frames}) with --frame or "frame" in the session`,
		);
	}
	const pixelElement = ds.elements['x7fe00010'];
	if (!pixelElement) throw new ImageRefusal(at(field.pixelData), 'is missing');

	let plane: GreyPlane;
	if (isJpeg) {
		plane = decodeJpegFrame(ds, pixelElement, frameIndex, photometric, columns, rows, at);
	} else {
		if (bitsAllocated !== 8 && bitsAllocated !== 16)
			throw new ImageRefusal(at(field.bitsAllocated), `is ${bitsAllocated}; 8 or 16 are read`);
		plane = decodeNative(
			ds,
			bytes,
			pixelElement,
			{
				rows,
				columns,
				samples,
				photometric,
				bitsAllocated,
				bitsStored,
				frameIndex,
				bigEndian: syntax === '1.2.840.10008.1.2.2',
			},
			at,
		);
	}

	const notes: string[] = [];
	if (frames > 1) notes.push(`frame ${frameIndex + 1} of ${frames}`);
	if (plane.colouredPixels) notes.push(`${plane.colouredPixels} coloured pixels masked`);
	if (hasRegionSequence(ds)) {
		const r = tissueRegion(ds, columns, rows);
		if (r.othersIgnored) notes.push(`${r.othersIgnored + 1} tissue regions; the largest is measured`);
		return {
			width: columns,
			height: rows,
			grey: plane.grey,
			mask: plane.mask,
			region: r.rect,
			rows: {originCm: r.originCm, cmPerRow: r.cmPerRow},
			cmPerColumn: r.cmPerColumn,
			depthScaleFrom: 'ultrasound-region',
			notes,
		};
	}
	if (!options.pixelScale) {
		throw new ImageRefusal(
			at('(0018,6011) Sequence of Ultrasound Regions'),
			'is missing and the session gives no pixelScale; give a calibrated still or pixelScale (cmPerPixel, topRowCm)',
		);
	}
	const s = options.pixelScale;
	notes.push("no ultrasound region: the whole image is measured with the session's pixelScale");
	return {
		width: columns,
		height: rows,
		grey: plane.grey,
		mask: plane.mask,
		region: {x0: 0, y0: 0, x1: columns - 1, y1: rows - 1},
		rows: {originCm: s.topRowCm + s.cmPerPixel / 2, cmPerRow: s.cmPerPixel},
		cmPerColumn: s.cmPerPixel,
		depthScaleFrom: 'pixel-scale',
		notes,
	};
}

interface NativeLayout {
	readonly rows: number;
	readonly columns: number;
	readonly samples: number;
	readonly photometric: string;
	readonly bitsAllocated: number;
	readonly bitsStored: number;
	readonly frameIndex: number;
	readonly bigEndian: boolean;
}

function decodeNative(
	ds: DataSet,
	bytes: Uint8Array,
	el: Element,
	l: NativeLayout,
	at: (n: string) => string,
): GreyPlane {
	const n = l.rows * l.columns;
	const bytesPerSample = l.bitsAllocated / 8;
	const ybr422 = l.photometric === 'YBR_FULL_422';
	const frameBytes = ybr422 ? n * 2 * bytesPerSample : n * l.samples * bytesPerSample;
	if (el.encapsulatedPixelData)
		throw new ImageRefusal(at(field.pixelData), 'is encapsulated but the transfer syntax says native');
	const start = el.dataOffset + l.frameIndex * frameBytes;
	const available = Math.min(el.length, bytes.length - el.dataOffset) - l.frameIndex * frameBytes;
	if (!(el.length > 0) || available < frameBytes) {
		throw new ImageRefusal(
			at(field.pixelData),
			`holds ${Math.max(0, available)} bytes for this frame but ${l.columns} × ${l.rows} pixels need ${frameBytes}; the file is truncated`,
		);
	}
	const raw = bytes.subarray(start, start + frameBytes);
	const sample = (i: number): number =>
		bytesPerSample === 1
			? raw[i]!
			: l.bigEndian
				? (raw[2 * i]! << 8) | raw[2 * i + 1]!
				: raw[2 * i]! | (raw[2 * i + 1]! << 8);
	const maxValue = 2 ** Math.min(l.bitsStored, l.bitsAllocated) - 1;
	const to255 = 255 / maxValue;
	const needSamples = (k: number) => {
		if (l.samples !== k) throw new ImageRefusal(at(field.samples), `is ${l.samples}; ${l.photometric} needs ${k}`);
	};
	switch (l.photometric) {
		case 'MONOCHROME1':
		case 'MONOCHROME2': {
			needSamples(1);
			const values = bytesPerSample === 1 ? raw : Float32Array.from({length: n}, (_, i) => sample(i));
			return greyFromMonochrome(values, n, maxValue, l.photometric === 'MONOCHROME1');
		}
		case 'RGB':
		case 'YBR_FULL': {
			needSamples(3);
			const planar = ds.uint16('x00280006') ?? 0;
			if (planar !== 0 && planar !== 1) throw new ImageRefusal(at(field.planar), `is ${planar}; 0 or 1`);
			const idx = planar === 0 ? (i: number, c: number) => 3 * i + c : (i: number, c: number) => c * n + i;
			if (l.photometric === 'RGB' && planar === 0 && bytesPerSample === 1)
				return greyFromInterleavedRgb(l.columns, l.rows, raw);
			if (l.photometric === 'RGB') {
				return greyFromRgb(l.columns, l.rows, (i, out) => {
					for (let c = 0; c < 3; c++) out[c] = sample(idx(i, c)) * to255;
				});
			}
			return greyFromRgb(l.columns, l.rows, (i, out) =>
				ybrToRgb(sample(idx(i, 0)) * to255, sample(idx(i, 1)) * to255, sample(idx(i, 2)) * to255, out),
			);
		}
		case 'YBR_FULL_422': {
			needSamples(3);
			if (l.columns % 2)
				throw new ImageRefusal(at(field.columns), `is ${l.columns}; YBR_FULL_422 needs an even number of columns`);
			// Pairs of pixels share chroma: Y1 Y2 Cb Cr (PS3.3 C.7.6.3.1.2).
			return greyFromRgb(l.columns, l.rows, (i, out) => {
				const pair = i >> 1;
				ybrToRgb(sample(4 * pair + (i & 1)) * to255, sample(4 * pair + 2) * to255, sample(4 * pair + 3) * to255, out);
			});
		}
		case 'PALETTE COLOR': {
			needSamples(1);
			const lut = paletteTables(ds, at);
			return greyFromRgb(l.columns, l.rows, (i, out) => {
				const v = sample(i);
				const k = Math.min(lut.entries - 1, Math.max(0, v - lut.first));
				out[0] = lut.red[k]!;
				out[1] = lut.green[k]!;
				out[2] = lut.blue[k]!;
			});
		}
		default:
			throw new ImageRefusal(
				at(field.photometric),
				`is "${l.photometric}"; MONOCHROME1, MONOCHROME2, RGB, YBR_FULL, YBR_FULL_422 and PALETTE COLOR are read`,
			);
	}
}

/** The three palette tables on 0–255 (16-bit entries shifted right by 8). */
function paletteTables(
	ds: DataSet,
	at: (n: string) => string,
): {entries: number; first: number; red: Float32Array; green: Float32Array; blue: Float32Array} {
	const channel = (descriptorTag: string, dataTag: string, name: string) => {
		const el = ds.elements[descriptorTag];
		if (!el || el.length < 6) throw new ImageRefusal(at(name), 'is missing');
		const entries = ds.uint16(descriptorTag, 0) || 65536;
		const first = ds.uint16(descriptorTag, 1) ?? 0;
		const bits = ds.uint16(descriptorTag, 2) ?? 8;
		const data = ds.elements[dataTag];
		if (!data) throw new ImageRefusal(at(name.replace('Descriptor', 'Data')), 'is missing');
		const table = new Float32Array(entries);
		const wide = bits > 8;
		if (data.length < entries * (wide ? 2 : 1))
			throw new ImageRefusal(at(name.replace('Descriptor', 'Data')), `is shorter than its ${entries} entries`);
		for (let k = 0; k < entries; k++) {
			table[k] = wide ? (ds.uint16(dataTag, k) ?? 0) >> 8 : ds.byteArray[data.dataOffset + k]!;
		}
		return {entries, first, table};
	};
	const r = channel('x00281101', 'x00281201', field.palette);
	const g = channel('x00281102', 'x00281202', '(0028,1102) Green Palette Color Lookup Table Descriptor');
	const b = channel('x00281103', 'x00281203', '(0028,1103) Blue Palette Color Lookup Table Descriptor');
	return {
		entries: Math.min(r.entries, g.entries, b.entries),
		first: r.first,
		red: r.table,
		green: g.table,
		blue: b.table,
	};
}

/** Start-of-frame dimensions of a JPEG stream, read before decoding so a size claim over the cap is refused. */
function jpegFrameSize(data: Uint8Array): {width: number; height: number} | undefined {
	let p = 2;
	while (p + 9 < data.length) {
		if (data[p] !== 0xff) return undefined;
		const marker = data[p + 1]!;
		if (marker === 0xff) {
			p++;
			continue;
		}
		const length = (data[p + 2]! << 8) | data[p + 3]!;
		if (marker >= 0xc0 && marker <= 0xcf && marker !== 0xc4 && marker !== 0xc8 && marker !== 0xcc) {
			return {height: (data[p + 5]! << 8) | data[p + 6]!, width: (data[p + 7]! << 8) | data[p + 8]!};
		}
		p += 2 + length;
	}
	return undefined;
}

function decodeJpegFrame(
	ds: DataSet,
	el: Element,
	frameIndex: number,
	photometric: string,
	columns: number,
	rows: number,
	at: (n: string) => string,
): GreyPlane {
	let data: Uint8Array;
	try {
		const fragments = el.fragments ?? [];
		if (!el.encapsulatedPixelData || !fragments.length) throw new Error('no encapsulated fragments');
		const table = el.basicOffsetTable?.length ? el.basicOffsetTable : dicomParser.createJPEGBasicOffsetTable(ds, el);
		data =
			table.length <= 1
				? dicomParser.readEncapsulatedPixelDataFromFragments(ds, el, 0, fragments.length)
				: dicomParser.readEncapsulatedImageFrame(ds, el, frameIndex, table);
	} catch (error) {
		throw new ImageRefusal(at(field.pixelData), `holds no readable JPEG frame ${frameIndex + 1} (${messageOf(error)})`);
	}
	const size = jpegFrameSize(data);
	if (!size) throw new ImageRefusal(at(field.pixelData), 'is not a JPEG baseline stream (no frame header)');
	if (size.width > imageLimits.maxSidePx || size.height > imageLimits.maxSidePx) {
		throw new ImageRefusal(
			at(field.pixelData),
			`claims ${size.width} × ${size.height} pixels; images up to ${imageLimits.maxSidePx} pixels a side are read`,
		);
	}
	if (size.width !== columns || size.height !== rows) {
		throw new ImageRefusal(
			at(field.pixelData),
			`JPEG frame is ${size.width} × ${size.height} but Columns × Rows say ${columns} × ${rows}`,
		);
	}
	let decoded: {width: number; height: number; data: Uint8Array};
	try {
		// PI = RGB means the JPEG holds RGB, so no YCbCr → RGB transform (jpeg-js would apply one).
		decoded = jpeg.decode(data, {
			useTArray: true,
			formatAsRGBA: false,
			...(photometric === 'RGB' ? {colorTransform: false} : {}),
			maxResolutionInMP: 70,
			maxMemoryUsageInMB: 512,
		});
	} catch (error) {
		throw new ImageRefusal(at(field.pixelData), `JPEG frame cannot be decoded (${messageOf(error)})`);
	}
	const n = decoded.width * decoded.height;
	const channels = decoded.data.length / n;
	if (channels === 1) return greyFromMonochrome(decoded.data, n, 255, photometric === 'MONOCHROME1');
	const px = decoded.data;
	return greyFromRgb(decoded.width, decoded.height, (i, out) => {
		out[0] = px[3 * i]!;
		out[1] = px[3 * i + 1]!;
		out[2] = px[3 * i + 2]!;
	});
}

function messageOf(error: unknown): string {
	const m = typeof error === 'string' ? error : ((error as Error)?.message ?? String(error));
	return m.slice(0, 160);
}
