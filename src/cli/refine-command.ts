/**
 * `evenecho refine IMAGE --plan PLAN`: measure one exported still of the patient, taken with known
 * settings, against the plan; print the band levels, the slider and master corrections and the
 * measured attenuation of one layer; optionally write the plan with that attenuation.
 * Bad input: exit 2 naming the problem, nothing written.
 */
import {stdin, stdout} from 'node:process';
import {createInterface} from 'node:readline/promises';
import type {Command} from 'commander';
import {frameFromImage} from '../analysis/frame-from-image.js';
import {refineImage} from '../analysis/refine-image.js';
import {entryAt, writeFileAtomic} from '../files/atomic-write.js';
import {FileRefusedError} from '../files/file-errors.js';
import {printable} from '../files/printable.js';
import {readImageFile} from '../image/read-image.js';
import {ImageRefusal} from '../image/image-refusal.js';
import {parseAppliedSettings} from '../plan/applied-settings.js';
import {planWithMeasuredLayer} from '../plan/measured-layer.js';
import {refineJson, refineText} from '../report/refine-report.js';
import {numberOption} from './option-values.js';
import {readJsonInputOrRefuse, readPlanFile} from './read-plan-file.js';
import {resolvePlan} from '../plan/resolve-plan.js';
import type {ProfileReading} from '../analysis/profile-level-map.js';
import type {EnginePlan} from '../engine/types.js';
import {UsageError} from '../errors/usage-error.js';

interface RefineOptions {
	plan: string;
	scanner?: string;
	applied?: string;
	layer?: string;
	frame?: string;
	cmPerPixel?: string;
	topCm?: string;
	dynamicRange: string;
	format: string;
	writePlan?: string;
	force?: boolean;
}

async function confirmReplace(path: string): Promise<boolean> {
	if (!stdin.isTTY || !stdout.isTTY) return false;
	const rl = createInterface({input: stdin, output: process.stderr});
	try {
		const answer = await rl.question(`${printable(path)} exists. Replace it? [y/N] `);
		return /^y(es)?$/i.test(answer.trim());
	} finally {
		rl.close();
	}
}

/**
 * The stored profile named by --scanner or the plan's "scanner" field: the plan is resolved with its
 * depth response, noise budget and slider range, and the image read through its grey map. The store
 * is loaded only when a profile is named.
 */
async function measuredScanner(id: string | undefined, field: string) {
	if (id === undefined) return undefined;
	const {openScannerProfileStore} = await import('../store/scanner-profile-store.js');
	const {scannerResponseOf} = await import('../calibration/profile-document.js');
	const {profileReading} = await import('../analysis/profile-level-map.js');
	try {
		const profile = openScannerProfileStore().get(id);
		const reading: ProfileReading = profileReading(profile);
		return {scanner: scannerResponseOf(profile), reading};
	} catch (error) {
		if (error instanceof UsageError) throw new UsageError(`${field}: ${error.message}`);
		throw error;
	}
}

export function registerRefineCommand(program: Command): void {
	program
		.command('refine')
		.description(
			"measure a patient image taken with known settings against a plan: band levels, slider corrections, the layer's own attenuation",
		)
		.argument('<image>', 'DICOM still or PNG of the patient')
		.requiredOption('--plan <plan>', 'the plan the image is compared with (JSON, or - for standard input)')
		.option(
			'--scanner <id>',
			'scanner profile (evenecho scanner list) whose grey map, depth response and slider ' +
				'travel read the image (default: the one the plan names)',
		)
		.option(
			'--applied <settings>',
			"SETTINGS.json: the sliders and master the image was taken with (default: the plan's own fit)",
		)
		.option(
			'--layer <n>',
			'layer whose attenuation is measured, 1 = under the skin (default: the deepest in the image)',
		)
		.option('--frame <k>', 'frame of a multi-frame DICOM, 1-based')
		.option('--cm-per-pixel <cm>', 'depth scale for PNG (or a DICOM without ultrasound regions): cm per pixel')
		.option('--top-cm <cm>', 'with --cm-per-pixel: displayed depth of the top edge of the first row, cm')
		.option('--dynamic-range <dB>', "without a scanner profile: the display's dynamic range assumed, dB", '60')
		.option('--format <format>', 'text or json', 'text')
		.option(
			'--write-plan <file>',
			'write the plan with the measured attenuation for that layer (asks before replacing)',
		)
		.option('--force', 'with --write-plan: replace an existing file without asking')
		.action(async (imagePath: string, opts: RefineOptions) => {
			if (!['text', 'json'].includes(opts.format))
				throw new UsageError(`--format: must be text or json (got "${opts.format}")`);
			const dynamicRangeDb = numberOption('dynamic-range', opts.dynamicRange, {min: 10, max: 120}, 'dB');
			if ((opts.cmPerPixel === undefined) !== (opts.topCm === undefined)) {
				throw new UsageError('--cm-per-pixel and --top-cm go together: give both or neither');
			}
			const pixelScale =
				opts.cmPerPixel !== undefined && opts.topCm !== undefined
					? {
							cmPerPixel: numberOption('cm-per-pixel', opts.cmPerPixel, {min: 0.0001, max: 1}, 'cm'),
							topRowCm: numberOption('top-cm', opts.topCm, {min: -10, max: 40}, 'cm'),
						}
					: undefined;
			const frameNumber =
				opts.frame === undefined ? undefined : numberOption('frame', opts.frame, {min: 1, max: 10000}, '');
			if (frameNumber !== undefined && !Number.isInteger(frameNumber))
				throw new UsageError('--frame: must be a whole number from 1');

			const read = await readPlanFile(opts.plan);
			const {doc} = read;
			const measured = await measuredScanner(
				opts.scanner ?? doc.scanner,
				opts.scanner !== undefined ? '--scanner' : 'scanner',
			);
			const plan: EnginePlan = measured ? resolvePlan(doc, measured.scanner) : read.plan;
			let layerIndex: number | undefined;
			if (opts.layer !== undefined) {
				const n = numberOption('layer', opts.layer, {min: 1, max: plan.layers.length}, '');
				if (!Number.isInteger(n))
					throw new UsageError(`--layer: must be a whole number from 1 to ${plan.layers.length}`);
				layerIndex = n - 1;
			}
			let applied: {slidersDb: number[]; masterGainDb: number} | undefined;
			if (opts.applied !== undefined) {
				const s = parseAppliedSettings(await readJsonInputOrRefuse(opts.applied, 'settings file'), plan);
				if (!s.ok) throw new UsageError(`${printable(opts.applied)}: not valid settings for this plan`, s.errors);
				applied = {slidersDb: [...s.value.sliders], masterGainDb: s.value.masterGainDb};
			}

			let image;
			try {
				image = readImageFile(imagePath, {
					...(frameNumber !== undefined ? {frame: frameNumber} : {}),
					...(pixelScale ? {pixelScale} : {}),
				});
			} catch (error) {
				if (error instanceof ImageRefusal || error instanceof FileRefusedError) throw new UsageError(error.message);
				throw error;
			}
			const {frame, region, depthScale} = frameFromImage(image);
			const outcome = refineImage({
				frame,
				region,
				plan,
				...(applied ? {applied} : {}),
				...(layerIndex !== undefined ? {layerIndex} : {}),
				dynamicRangeDb,
				...(measured ? {levelMap: measured.reading.levelMap, sliderTravelDb: measured.reading.sliderTravelDb} : {}),
			});
			if (!outcome.ok) throw new UsageError(`${printable(imagePath)}: ${outcome.problem}`);

			if (opts.writePlan !== undefined) {
				if (!outcome.attenuation) {
					throw new UsageError(
						`--write-plan: nothing measured to write (${outcome.cannotTell}); ${printable(opts.writePlan)} not written`,
					);
				}
				const target = opts.writePlan;
				let replace = false;
				if (entryAt(target)) {
					replace = opts.force === true || (await confirmReplace(target));
					if (!replace)
						throw new UsageError(
							`--write-plan: ${printable(target)} exists; not replaced (answer y when asked, or add --force)`,
						);
				}
				const written = planWithMeasuredLayer(doc, outcome.attenuation);
				try {
					writeFileAtomic(target, JSON.stringify(written, null, 2) + '\n', {replace});
				} catch (error) {
					if (error instanceof FileRefusedError) throw new UsageError(`--write-plan: ${error.message}`);
					throw error;
				}
			}
			const source = {image: printable(imagePath), frame: frameNumber ?? null, plan: plan.name, depthScale};
			if (opts.format === 'json') stdout.write(JSON.stringify(refineJson(outcome, source), null, 2) + '\n');
			else {
				stdout.write(refineText(outcome, source));
				if (opts.writePlan !== undefined)
					stdout.write(`  Plan with the measured layer written to ${printable(opts.writePlan)}.\n`);
			}
		});
}
