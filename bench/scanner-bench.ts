/**
 * Scanner calibration: `scanner calibrate` on the 7-image 600×480 DICOM demo series (made by
 * `evenecho simulate --kind phantom-series`), wall time of the command against its 1.5 s target,
 * and in this process the split between decoding the images and the analysis; then reading one
 * 1024×768 JPEG-baseline DICOM still (reported).
 */
import {spawnSync} from 'node:child_process';
import {mkdtempSync, rmSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {dirname, join} from 'node:path';
import {performance} from 'node:perf_hooks';
import {fileURLToPath} from 'node:url';
import dcmjs from 'dcmjs';
import jpeg from 'jpeg-js';
import {calibrateScanner} from '../src/calibration/scanner-calibration.js';
import {loadSession} from '../src/image/load-session.js';
import {readImageFile} from '../src/image/read-image.js';
import {median, note, seeded, target} from './bench-tools.js';

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, '..', '..');
const cli = join(root, 'dist', 'bundle', 'evenecho.cjs');

/** A 1024×768 JPEG-baseline (YBR_FULL_422) Ultrasound Image Storage still, written with dcmjs. */
function jpegStill(path: string): void {
	const w = 1024;
	const h = 768;
	const rand = seeded(7);
	const rgba = new Uint8Array(w * h * 4);
	for (let i = 0; i < w * h; i++) {
		const v = Math.min(255, Math.floor(-40 * Math.log(1 - rand() * 0.999)) + 20);
		rgba.set([v, v, v, 255], 4 * i);
	}
	const stream = jpeg.encode({width: w, height: h, data: rgba}, 90).data;
	const {DicomMetaDictionary, DicomDict} = (
		dcmjs as {
			data: {
				DicomMetaDictionary: {denaturalizeDataset: (d: unknown) => unknown};
				DicomDict: new (m: unknown) => {dict: unknown; write: () => ArrayBuffer};
			};
		}
	).data;
	const sop = '1.2.840.10008.5.1.4.1.1.6.1';
	const dict = new DicomDict(
		DicomMetaDictionary.denaturalizeDataset({
			FileMetaInformationVersion: new Uint8Array([0, 1]).buffer,
			MediaStorageSOPClassUID: sop,
			MediaStorageSOPInstanceUID: '2.25.42',
			TransferSyntaxUID: '1.2.840.10008.1.2.4.50',
			ImplementationClassUID: '2.25.43',
		}),
	);
	dict.dict = DicomMetaDictionary.denaturalizeDataset({
		SOPClassUID: sop,
		SOPInstanceUID: '2.25.42',
		Modality: 'US',
		Rows: h,
		Columns: w,
		SamplesPerPixel: 3,
		PhotometricInterpretation: 'YBR_FULL_422',
		PlanarConfiguration: 0,
		BitsAllocated: 8,
		BitsStored: 8,
		HighBit: 7,
		PixelRepresentation: 0,
		LossyImageCompression: '01',
		SequenceOfUltrasoundRegions: [
			{
				RegionSpatialFormat: 1,
				RegionDataType: 1,
				RegionFlags: 0,
				RegionLocationMinX0: 100,
				RegionLocationMinY0: 60,
				RegionLocationMaxX1: 923,
				RegionLocationMaxY1: 747,
				ReferencePixelX0: 0,
				ReferencePixelY0: 0,
				PhysicalUnitsXDirection: 3,
				PhysicalUnitsYDirection: 3,
				ReferencePixelPhysicalValueX: 0,
				ReferencePixelPhysicalValueY: 0,
				PhysicalDeltaX: 0.0233,
				PhysicalDeltaY: 0.0233,
			},
		],
		PixelData: [stream.buffer.slice(stream.byteOffset, stream.byteOffset + stream.byteLength)],
		_vrMap: {PixelData: 'OB'},
	});
	writeFileSync(path, Buffer.from(dict.write()));
}

export async function run(): Promise<void> {
	console.log('\nscanner calibration');
	const dir = mkdtempSync(join(tmpdir(), 'evenecho-scanner-bench-'));
	const env = {...process.env, EVENECHO_HOME: join(dir, 'home')};
	try {
		const made = spawnSync(
			process.execPath,
			[
				cli,
				'simulate',
				join(root, 'presets', 'upper-abdomen.json'),
				'--out',
				join(dir, 'series'),
				'--kind',
				'phantom-series',
				'--format',
				'dicom',
				'--seed',
				'1',
			],
			{env, encoding: 'utf8'},
		);
		if (made.status !== 0) {
			note('demo series', `not made (${made.stderr.trim().split('\n')[0] ?? 'simulate failed'}); skipped`);
		} else {
			const session = join(dir, 'series', 'session.json');
			const walls: number[] = [];
			for (let i = 0; i < 5; i++) {
				const t0 = performance.now();
				const r = spawnSync(
					process.execPath,
					[cli, 'scanner', 'calibrate', session, '--name', `bench ${i}`, '--format', 'json'],
					{env, encoding: 'utf8'},
				);
				walls.push(performance.now() - t0);
				if (r.status !== 0) throw new Error(`scanner calibrate failed: ${r.stderr.slice(0, 300)}`);
			}
			const wall = median(walls);
			target(
				'`scanner calibrate` on the 7-image 600×480 DICOM series, wall (median of 5)',
				`${(wall / 1000).toFixed(2)} s`,
				'≤ 1.5 s',
				wall <= 1500,
			);
			const decode: number[] = [];
			const analysis: number[] = [];
			// CPU time beside the wall time: on a shared machine the wall time also counts the waits
			// for a core, the CPU time only the work.
			const decodeCpu: number[] = [];
			const analysisCpu: number[] = [];
			const cpuMs = (u: NodeJS.CpuUsage) => (u.user + u.system) / 1000;
			for (let i = 0; i < 5; i++) {
				const c0 = process.cpuUsage();
				const loaded = loadSession(session);
				const c1 = process.cpuUsage();
				const t0 = performance.now();
				calibrateScanner(loaded.input);
				analysis.push(performance.now() - t0);
				analysisCpu.push(cpuMs(process.cpuUsage(c1)));
				decodeCpu.push(cpuMs(process.cpuUsage(c0)) - analysisCpu[i]!);
				decode.push(loaded.decodeMs);
			}
			note(
				'in process: decoding 7 images / analysis, wall (medians of 5)',
				`${median(decode).toFixed(0)} ms / ${median(analysis).toFixed(0)} ms`,
			);
			note(
				'in process: decoding 7 images / analysis, CPU time (medians of 5)',
				`${median(decodeCpu).toFixed(0)} ms / ${median(analysisCpu).toFixed(0)} ms`,
			);
		}
		const still = join(dir, 'still.dcm');
		jpegStill(still);
		readImageFile(still);
		const reads: number[] = [];
		for (let i = 0; i < 7; i++) {
			const t0 = performance.now();
			readImageFile(still);
			reads.push(performance.now() - t0);
		}
		note('reading one 1024×768 JPEG-baseline DICOM still (median of 7)', `${median(reads).toFixed(0)} ms`);
	} finally {
		rmSync(dir, {recursive: true, force: true});
	}
}
