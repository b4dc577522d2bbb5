/**
 * Writes small DICOM Part 10 files in the tests with dcmjs 0.51.1 (an independent writer), so no
 * real sample file is ever committed. Regions follow DICOM PS3.3 C.8.5.5.
 */
import dcmjs from 'dcmjs';

const {DicomMetaDictionary, DicomDict} = dcmjs.data;

export const syntaxes = {
	explicitLittle: '1.2.840.10008.1.2.1',
	implicitLittle: '1.2.840.10008.1.2',
	jpegBaseline: '1.2.840.10008.1.2.4.50',
	jpeg2000: '1.2.840.10008.1.2.4.91',
} as const;

const ultrasoundImageStorage = '1.2.840.10008.5.1.4.1.1.6.1';
const ultrasoundMultiframeStorage = '1.2.840.10008.5.1.4.1.1.3.1';

export interface RegionFixture {
	minX0: number;
	minY0: number;
	maxX1: number;
	maxY1: number;
	refPixelX0?: number;
	refPixelY0?: number;
	refValueY?: number;
	deltaX?: number;
	deltaY: number;
	unitsX?: number;
	unitsY?: number;
	spatialFormat?: number;
	dataType?: number;
}

export interface DicomFixture {
	rows: number;
	columns: number;
	photometric?: string;
	samples?: number;
	bitsAllocated?: number;
	planar?: 0 | 1;
	frames?: number;
	/** Native pixel bytes (all frames), or for JPEG one encoded stream per frame. */
	pixels: Uint8Array | Uint8Array[];
	syntax?: string;
	regions?: RegionFixture[];
	extra?: Record<string, unknown>;
	/** VRs for attributes whose dictionary VR is ambiguous (US or SS). */
	vrMap?: Record<string, string>;
}

function regionItem(r: RegionFixture): Record<string, unknown> {
	return {
		RegionSpatialFormat: r.spatialFormat ?? 1,
		RegionDataType: r.dataType ?? 1,
		RegionFlags: 0,
		RegionLocationMinX0: r.minX0,
		RegionLocationMinY0: r.minY0,
		RegionLocationMaxX1: r.maxX1,
		RegionLocationMaxY1: r.maxY1,
		ReferencePixelX0: r.refPixelX0 ?? 0,
		ReferencePixelY0: r.refPixelY0 ?? 0,
		PhysicalUnitsXDirection: r.unitsX ?? 3,
		PhysicalUnitsYDirection: r.unitsY ?? 3,
		ReferencePixelPhysicalValueX: 0,
		ReferencePixelPhysicalValueY: r.refValueY ?? 0,
		PhysicalDeltaX: r.deltaX ?? r.deltaY,
		PhysicalDeltaY: r.deltaY,
	};
}

function copyBuffer(a: Uint8Array): ArrayBuffer {
	return a.buffer.slice(a.byteOffset, a.byteOffset + a.byteLength) as ArrayBuffer;
}

export function writeDicom(f: DicomFixture): Uint8Array {
	const syntax = f.syntax ?? syntaxes.explicitLittle;
	const frames = f.frames ?? 1;
	const sopClass = frames > 1 ? ultrasoundMultiframeStorage : ultrasoundImageStorage;
	const bits = f.bitsAllocated ?? 8;
	const dataset: Record<string, unknown> = {
		SOPClassUID: sopClass,
		SOPInstanceUID: '2.25.1234567890',
		Modality: 'US',
		PatientName: 'Phantom^Test',
		Rows: f.rows,
		Columns: f.columns,
		SamplesPerPixel: f.samples ?? 1,
		PhotometricInterpretation: f.photometric ?? 'MONOCHROME2',
		BitsAllocated: bits,
		BitsStored: bits,
		HighBit: bits - 1,
		PixelRepresentation: 0,
		...(f.planar !== undefined ? {PlanarConfiguration: f.planar} : {}),
		...(frames > 1 ? {NumberOfFrames: String(frames)} : {}),
		...(f.regions ? {SequenceOfUltrasoundRegions: f.regions.map(regionItem)} : {}),
		...f.extra,
		PixelData: Array.isArray(f.pixels) ? f.pixels.map(copyBuffer) : copyBuffer(f.pixels),
		_vrMap: {PixelData: bits > 8 ? 'OW' : 'OB', ...f.vrMap},
	};
	const meta = {
		FileMetaInformationVersion: new Uint8Array([0, 1]).buffer,
		MediaStorageSOPClassUID: sopClass,
		MediaStorageSOPInstanceUID: '2.25.1234567890',
		TransferSyntaxUID: syntax,
		ImplementationClassUID: '2.25.987654321',
	};
	const dict = new DicomDict(DicomMetaDictionary.denaturalizeDataset(meta));
	dict.dict = DicomMetaDictionary.denaturalizeDataset(dataset);
	return new Uint8Array(dict.write());
}

/**
 * Rewrites the (explicit VR little endian) Sequence of Ultrasound Regions from undefined length,
 * as dcmjs writes it, to defined lengths, so both encodings are exercised. The region items hold
 * no nested sequences, which keeps this a plain byte rewrite.
 */
export function withDefinedLengthRegions(file: Uint8Array): Uint8Array {
	const header = [0x18, 0x00, 0x11, 0x60, 0x53, 0x51, 0x00, 0x00, 0xff, 0xff, 0xff, 0xff];
	const start = indexOf(file, header);
	if (start < 0) throw new Error('no undefined-length region sequence');
	let p = start + header.length;
	const items: Uint8Array[] = [];
	for (;;) {
		const group = file[p]! | (file[p + 1]! << 8);
		const element = file[p + 2]! | (file[p + 3]! << 8);
		if (group !== 0xfffe) throw new Error('unexpected bytes in the sequence');
		if (element === 0xe0dd) {
			p += 8;
			break;
		}
		// Item with undefined length: content runs to its item delimiter (FFFE,E00D).
		const contentStart = p + 8;
		const end = indexOf(file, [0xfe, 0xff, 0x0d, 0xe0, 0, 0, 0, 0], contentStart);
		items.push(file.subarray(contentStart, end));
		p = end + 8;
	}
	const itemBytes = items.reduce((s, it) => s + 8 + it.length, 0);
	const out = new Uint8Array(file.length - (p - start) + 12 + itemBytes);
	out.set(file.subarray(0, start), 0);
	const view = new DataView(out.buffer);
	let q = start;
	out.set(header.slice(0, 8), q);
	view.setUint32(q + 8, itemBytes, true);
	q += 12;
	for (const it of items) {
		view.setUint16(q, 0xfffe, true);
		view.setUint16(q + 2, 0xe000, true);
		view.setUint32(q + 4, it.length, true);
		out.set(it, q + 8);
		q += 8 + it.length;
	}
	out.set(file.subarray(p), q);
	return out;
}

function indexOf(hay: Uint8Array, needle: number[], from = 0): number {
	outer: for (let i = from; i <= hay.length - needle.length; i++) {
		for (let j = 0; j < needle.length; j++) if (hay[i + j] !== needle[j]) continue outer;
		return i;
	}
	return -1;
}
