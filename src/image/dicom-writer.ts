/**
 * DICOM Part 10 files of the Ultrasound Image Storage class (PS3.4; SOP class 1.2.840.10008.5.1.4.1.1.6.1),
 * native explicit little endian, 8-bit MONOCHROME2 or RGB, written with dcmjs 0.51. The US Region
 * Calibration module (PS3.3 C.8.5.5) gives the depth scale of the tissue region: displayed depth of
 * row y = RefPhysValueY + (y − MinY0 − RefPixelY0)·PhysicalDeltaY, in cm (units code 3).
 */
import {createHash} from 'node:crypto';
import dcmjs from 'dcmjs';
import type {PixelImage} from './png-writer.js';

export const ultrasoundImageStorage = '1.2.840.10008.5.1.4.1.1.6.1';
const explicitLittleEndian = '1.2.840.10008.1.2.1';
/** A UID root under 2.25 (UUID-derived, PS3.5 B.2): our identifiers are hashes, so the same
 * inputs give the same bytes. */
const implementationUid = '2.25.94710313588243217611053474036018813527';

/** An OID under 2.25 from a SHA-256 of `parts` (128 bits, as the UUID form allows). */
export function derivedUid(...parts: readonly (string | number)[]): string {
	const hash = createHash('sha256').update(parts.join('\u0000')).digest();
	return `2.25.${BigInt(`0x${hash.subarray(0, 16).toString('hex')}`).toString()}`;
}

export interface TissueRegion {
	/** Inclusive pixel rectangle of the 2-D tissue image. */
	readonly x0: number;
	readonly y0: number;
	readonly x1: number;
	readonly y1: number;
	/** cm per pixel, both directions. */
	readonly cmPerPixel: number;
	/** Probe centre frequency, for the informative Transducer Frequency (kHz). */
	readonly centerMhz: number;
}

export interface DicomRequest {
	readonly image: PixelImage;
	readonly region: TissueRegion;
	readonly studyUid: string;
	readonly seriesUid: string;
	readonly instanceUid: string;
	readonly instanceNumber: number;
	readonly seriesDescription: string;
	/** Stored in Image Comments: the illustration label and the settings used. */
	readonly comments: string;
}

/** Invented identity of every demo file: no real person or department. */
const demoPatient = {PatientName: 'Demo^Simulated', PatientID: 'EVENECHO-DEMO', PatientBirthDate: '', PatientSex: 'O'};

export function encodeUltrasoundDicom(req: DicomRequest): Uint8Array {
	const {image, region} = req;
	const rgb = image.channels === 3;
	const dataset: Record<string, unknown> = {
		SOPClassUID: ultrasoundImageStorage,
		SOPInstanceUID: req.instanceUid,
		StudyInstanceUID: req.studyUid,
		SeriesInstanceUID: req.seriesUid,
		StudyDate: '20260101',
		StudyTime: '090000',
		Modality: 'US',
		SeriesDescription: req.seriesDescription,
		SeriesNumber: 1,
		InstanceNumber: req.instanceNumber,
		ImageType: ['DERIVED', 'SECONDARY'],
		ImageComments: req.comments,
		BurnedInAnnotation: 'YES',
		...demoPatient,
		Rows: image.height,
		Columns: image.width,
		SamplesPerPixel: image.channels,
		PhotometricInterpretation: rgb ? 'RGB' : 'MONOCHROME2',
		...(rgb ? {PlanarConfiguration: 0} : {}),
		BitsAllocated: 8,
		BitsStored: 8,
		HighBit: 7,
		PixelRepresentation: 0,
		SequenceOfUltrasoundRegions: [
			{
				RegionSpatialFormat: 1,
				RegionDataType: 1,
				RegionFlags: 0,
				RegionLocationMinX0: region.x0,
				RegionLocationMinY0: region.y0,
				RegionLocationMaxX1: region.x1,
				RegionLocationMaxY1: region.y1,
				// The lateral origin at the region's centre column, depth 0 at its top row.
				ReferencePixelX0: Math.round((region.x1 - region.x0) / 2),
				ReferencePixelY0: 0,
				PhysicalUnitsXDirection: 3,
				PhysicalUnitsYDirection: 3,
				ReferencePixelPhysicalValueX: 0,
				ReferencePixelPhysicalValueY: 0,
				PhysicalDeltaX: region.cmPerPixel,
				PhysicalDeltaY: region.cmPerPixel,
				TransducerFrequency: Math.round(region.centerMhz * 1000),
			},
		],
		// An even length is required; 8-bit data of odd size gets one pad byte.
		PixelData: padEven(image.data).buffer,
		_vrMap: {PixelData: 'OB'},
	};
	const meta = {
		MediaStorageSOPClassUID: ultrasoundImageStorage,
		MediaStorageSOPInstanceUID: req.instanceUid,
		TransferSyntaxUID: explicitLittleEndian,
		ImplementationClassUID: implementationUid,
		ImplementationVersionName: 'EVENECHO_0_1',
		FileMetaInformationVersion: new Uint8Array([0, 1]).buffer,
	};
	const {DicomDict, DicomMetaDictionary} = dcmjs.data;
	const dict = new DicomDict(DicomMetaDictionary.denaturalizeDataset(meta));
	dict.dict = DicomMetaDictionary.denaturalizeDataset(dataset);
	return new Uint8Array(dict.write());
}

function padEven(data: Uint8Array): Uint8Array {
	if (data.length % 2 === 0) return data.slice();
	const out = new Uint8Array(data.length + 1);
	out.set(data);
	return out;
}
