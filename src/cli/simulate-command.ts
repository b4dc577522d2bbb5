/**
 * `evenecho simulate PLAN --out DIR`: invented demo images with their truth — a phantom series with
 * a ready scanner session file, or one patient image with the settings it was taken at. Every file
 * is written or none.
 */
import {resolve} from 'node:path';
import type {Command} from 'commander';
import {derivedUid, encodeUltrasoundDicom} from '../image/dicom-writer.js';
import {encodePng} from '../image/png-writer.js';
import type {BatchEntry} from '../files/file-batch.js';
import {UsageError} from '../errors/usage-error.js';
import {choiceOption} from './choice-option.js';
import {patientImage, phantomSeries, type DemoSet} from '../simulate/demo-images.js';
import {outputFolder, removeEmptyFolder, seedLimit, wholeNumberOption, writeOutputBatch} from './image-options.js';
import {readPlanFile} from './read-plan-file.js';

const kinds = ['phantom-series', 'patient'] as const;
const formats = ['dicom', 'png'] as const;
const illustration = 'Simulated illustration (evenecho), invented data: not a real patient or scanner image.';

interface SimulateOptions {
	out: string;
	kind: string;
	format: string;
	seed: string;
	cyst?: boolean;
	brightLine?: boolean;
	force?: boolean;
}

function jsonBytes(value: unknown): Uint8Array {
	return new TextEncoder().encode(`${JSON.stringify(value, null, 2)}\n`);
}

/** Image files of a demo set in the chosen format. */
export function imageFiles(
	set: DemoSet,
	format: (typeof formats)[number],
	kind: string,
	seed: number,
	planName: string,
): BatchEntry[] {
	const studyUid = derivedUid('study', kind, planName, seed);
	const seriesUid = derivedUid('series', kind, planName, seed);
	return set.images.map((img, k) => {
		const pixels = {width: img.width, height: img.height, channels: img.channels, data: img.data};
		if (format === 'png') {
			return {
				name: `${img.name}.png`,
				data: encodePng(pixels, {
					Description: illustration,
					Comment: `${img.role}, master gain ${img.masterGainDb} dB`,
				}),
			};
		}
		const bytes = encodeUltrasoundDicom({
			image: pixels,
			region: {...set.region, cmPerPixel: set.cmPerPixel, centerMhz: centerMhzOf(set)},
			studyUid,
			seriesUid,
			instanceUid: derivedUid('image', kind, planName, seed, img.name),
			instanceNumber: k + 1,
			seriesDescription:
				kind === 'patient' ? 'evenecho demo patient (simulated)' : 'evenecho demo phantom series (simulated)',
			comments: `${illustration} ${img.role}, master gain ${img.masterGainDb} dB${img.slider ? `, slider ${img.slider} at full travel` : ''}`,
		});
		return {name: `${img.name}.dcm`, data: bytes};
	});
}

function centerMhzOf(set: DemoSet): number {
	const probe = set.truth['probe'] as {centerMhz?: number} | undefined;
	return probe?.centerMhz ?? 0;
}

export function registerSimulateCommand(program: Command): void {
	program
		.command('simulate')
		.description(
			'write invented demo images with their truth: a phantom series (with a scanner session file) or a patient image',
		)
		.argument('<plan>', 'plan file (JSON) or - for standard input')
		.requiredOption('--out <dir>', 'folder to write into (made if missing; its parent must exist)')
		.option('--kind <kind>', 'phantom-series or patient', 'phantom-series')
		.option('--format <format>', 'dicom (Ultrasound Image Storage) or png', 'dicom')
		.option('--seed <n>', 'speckle seed, a whole number; the same seed gives the same bytes', '1')
		.option('--cyst', 'patient: draw an anechoic cyst-like disc in the measured columns')
		.option('--bright-line', 'patient: draw a bright specular line across the measured columns')
		.option('--force', 'replace files that already exist')
		.action(async (planPath: string, opts: SimulateOptions) => {
			const kind = choiceOption('kind', opts.kind, kinds);
			const format = choiceOption('format', opts.format, formats);
			const seed = wholeNumberOption('seed', opts.seed, seedLimit, '');
			const {plan} = await readPlanFile(planPath);
			const dir = resolve(opts.out);
			const extension = format === 'dicom' ? 'dcm' : 'png';
			if (kind !== 'patient' && (opts.cyst || opts.brightLine))
				throw new UsageError('--cyst and --bright-line go with --kind patient');
			const set =
				kind === 'patient'
					? patientImage(plan, seed, extension, {cyst: opts.cyst === true, brightLine: opts.brightLine === true})
					: phantomSeries(plan, seed, extension);
			const files: BatchEntry[] = imageFiles(set, format, kind, seed, plan.name);
			if (set.session) files.push({name: 'session.json', data: jsonBytes(set.session)});
			if (set.appliedSettings) files.push({name: 'applied-settings.json', data: jsonBytes(set.appliedSettings)});
			files.push({name: 'truth.json', data: jsonBytes(set.truth)});
			const created = outputFolder(dir);
			try {
				writeOutputBatch('out', dir, files, opts.force === true);
			} catch (error) {
				if (created) removeEmptyFolder(dir);
				throw error;
			}
			process.stdout.write(
				`Wrote ${files.length} files to ${opts.out}: ${files.map((f) => f.name).join(', ')}.\n${illustration}\n`,
			);
		});
}
