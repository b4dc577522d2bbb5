/**
 * `evenecho scanner …`: measure the user's scanner from phantom images and keep the result as a
 * profile that plans can name. Data to stdout, messages to stderr, bad input exit 2.
 */
import type {Command} from 'commander';
import {CalibrationRefusal} from '../calibration/calibration-refusal.js';
import {profileFromCalibration} from '../calibration/profile-document.js';
import {calibrateScanner} from '../calibration/scanner-calibration.js';
import {readInput} from '../files/bounded-read.js';
import {FileRefusedError} from '../files/file-errors.js';
import {writeFileAtomic} from '../files/atomic-write.js';
import {loadSession} from '../image/load-session.js';
import {scannerProfileText} from '../report/scanner-profile-text.js';
import {checkProfileName, openScannerProfileStore} from '../store/scanner-profile-store.js';
import {UsageError} from '../errors/usage-error.js';
import {choiceOption} from './choice-option.js';

const formats = ['text', 'json'] as const;

function parseFrame(value: string | undefined): number | undefined {
	if (value === undefined) return undefined;
	const n = Number(value);
	if (!Number.isInteger(n) || n < 1 || n > 100000)
		throw new UsageError(`--frame: must be a whole number from 1 to 100000 (got "${value}")`);
	return n;
}

function say(message: string): void {
	process.stderr.write(`evenecho: ${message}\n`);
}

export function registerScannerCommand(program: Command): void {
	const scanner = program
		.command('scanner')
		.description(
			'measure your scanner from phantom images and keep it as a profile plans can name ' +
				'(calibrate, list, show, delete, rename, export, import)',
		);

	scanner
		.command('calibrate')
		.description(
			'measure grey map, depth response, slider travel and penetration from a session of phantom images, and store the profile',
		)
		.argument('<session>', 'session file (evenecho-scanner-session/1); image paths are relative to it')
		.option('--name <name>', 'profile name (default: the session label)')
		.option('--format <format>', 'text or json', 'text')
		.option('--frame <n>', 'frame to read from multi-frame images that do not name one, from 1')
		.option('--force', 'replace a profile of the same name')
		.action((session: string, opts: {name?: string; format: string; frame?: string; force?: boolean}) => {
			const format = choiceOption('format', opts.format, formats);
			const frame = parseFrame(opts.frame);
			try {
				const loaded = loadSession(session, frame === undefined ? {} : {frame});
				const {name, id} = checkProfileName(
					opts.name ?? loaded.session.label,
					opts.name === undefined ? 'label (used as the profile name; give --name)' : '--name',
				);
				const calibration = calibrateScanner(loaded.input);
				const profile = profileFromCalibration(calibration, id, name);
				const store = openScannerProfileStore();
				store.save(profile, {replace: opts.force === true});
				const stored = store.get(id);
				process.stdout.write(format === 'json' ? `${JSON.stringify(stored, null, 2)}\n` : scannerProfileText(stored));
				say(`stored scanner profile ${id}; name it in a plan as "scanner": "${id}"`);
			} catch (error) {
				if (error instanceof CalibrationRefusal) throw new UsageError(`${session}: ${error.message}`);
				throw error;
			}
		});

	scanner
		.command('list')
		.description('your scanner profiles')
		.option('--format <format>', 'text or json', 'text')
		.action((opts: {format: string}) => {
			const format = choiceOption('format', opts.format, formats);
			const {profiles, problems} = openScannerProfileStore().list();
			for (const p of problems) say(`note: ${p}`);
			if (format === 'json') {
				const rows = profiles.map((p) => ({
					id: p.id,
					name: p.name,
					label: p.label,
					centerMhz: p.probe.centerMhz,
					displayDepthCm: p.displayDepthCm,
					penetrationCm: p.penetrationCm,
					sliderTravelDb: p.sliderTravelDb,
					savedAt: p.savedAt ?? null,
				}));
				process.stdout.write(`${JSON.stringify(rows, null, 2)}\n`);
				return;
			}
			if (!profiles.length) {
				say('no scanner profiles yet; make one with evenecho scanner calibrate SESSION.json');
				return;
			}
			const rows = [
				['id', 'name', 'probe', 'depth', 'reach', 'travel'],
				...profiles.map((p) => [
					p.id,
					p.name,
					`${p.probe.centerMhz} MHz`,
					`${p.displayDepthCm} cm`,
					p.penetrationCm === null ? '—' : `${p.penetrationCm.toFixed(1)} cm`,
					p.sliderTravelDb === null ? '—' : `${p.sliderTravelDb.toFixed(1)} dB`,
				]),
			];
			const widths = rows[0]!.map((_, c) => Math.max(...rows.map((r) => [...r[c]!].length)));
			process.stdout.write(
				`${rows
					.map((r) =>
						r
							.map((cell, c) => cell.padEnd(widths[c]! + 2))
							.join('')
							.trimEnd(),
					)
					.join('\n')}\n`,
			);
		});

	scanner
		.command('show')
		.description('one profile in full')
		.argument('<profile>', 'id or name')
		.option('--format <format>', 'text or json', 'text')
		.action((query: string, opts: {format: string}) => {
			const format = choiceOption('format', opts.format, formats);
			const p = openScannerProfileStore().get(query);
			process.stdout.write(format === 'json' ? `${JSON.stringify(p, null, 2)}\n` : scannerProfileText(p));
		});

	scanner
		.command('delete')
		.description('delete a profile (plans that name it then fall back to the assumed ramp)')
		.argument('<profile>', 'id or name')
		.action((query: string) => {
			const removed = openScannerProfileStore().delete(query);
			say(`deleted scanner profile "${removed.name}" (${removed.id})`);
		});

	scanner
		.command('rename')
		.description('give a profile a new name (and so a new id)')
		.argument('<from>', 'id or name')
		.argument('<to>', 'new name')
		.option('--force', 'replace a profile that already has the new name')
		.action((from: string, to: string, opts: {force?: boolean}) => {
			const renamed = openScannerProfileStore().rename(from, to, {replace: opts.force === true});
			say(`renamed to "${renamed.name}" (${renamed.id}); plans naming the old id need the new one`);
			process.stdout.write(`${renamed.id}\n`);
		});

	scanner
		.command('export')
		.description('write profiles to a bundle file (all when none are named; - writes to standard output)')
		.argument('<file>', 'bundle file to write, or -')
		.argument('[profiles...]', 'ids or names')
		.option('--force', 'replace the file if it exists')
		.action((file: string, queries: string[], opts: {force?: boolean}) => {
			const text = openScannerProfileStore().exportBundle(queries);
			if (file === '-') {
				process.stdout.write(text);
				return;
			}
			try {
				writeFileAtomic(file, text, {replace: opts.force === true});
			} catch (error) {
				if (error instanceof FileRefusedError)
					throw new UsageError(
						error.code === 'exists' ? `${file}: already exists; use --force to replace it` : error.message,
					);
				throw error;
			}
			say(`exported to ${file}`);
		});

	scanner
		.command('import')
		.description('import a profile file or a bundle; - reads standard input')
		.argument('<file>', 'profile or bundle file, or -')
		.option('--force', 'replace profiles of the same names')
		.action(async (file: string, opts: {force?: boolean}) => {
			let text: string;
			try {
				text = (await readInput(file, {maxBytes: 20_000_000, what: 'profile bundle'})).bytes.toString('utf8');
			} catch (error) {
				if (error instanceof FileRefusedError) throw new UsageError(error.message);
				throw error;
			}
			const imported = openScannerProfileStore().importText(text, file, {replace: opts.force === true});
			say(
				`imported ${imported.length} scanner profile${imported.length === 1 ? '' : 's'}: ${imported.map((p) => p.id).join(', ')}`,
			);
			for (const p of imported) process.stdout.write(`${p.id}\n`);
		});
}
