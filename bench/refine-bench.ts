/**
 * `evenecho refine` on a 600×480 demo patient DICOM (a cyst and a bright line in the measured
 * columns) through a stored scanner profile: the whole command in a cold process (wall, median of
 * 7) against the 1 s target, and the split of one refinement in this process (warm, medians):
 * reading and decoding the file, the analysis (speckle mask and band levels), the α0 fit, and the
 * slider refit. The demo set is made by the tool itself — `simulate` (phantom series, patient) and
 * `scanner calibrate` into a temporary store — from an invented thin-wall upper-abdomen plan.
 */
import {spawnSync} from 'node:child_process';
import {existsSync, mkdtempSync, rmSync, writeFileSync} from 'node:fs';
import {loadavg, tmpdir} from 'node:os';
import {dirname, join} from 'node:path';
import {performance} from 'node:perf_hooks';
import {fileURLToPath} from 'node:url';
import {frameFromImage} from '../src/analysis/frame-from-image.js';
import {profileReading} from '../src/analysis/profile-level-map.js';
import {refineImage, type RefineStage} from '../src/analysis/refine-image.js';
import {scannerResponseOf} from '../src/calibration/profile-document.js';
import {readImageFile} from '../src/image/read-image.js';
import {parsePlan, resolvePlan} from '../src/plan/resolve-plan.js';
import {openScannerProfileStore} from '../src/store/scanner-profile-store.js';
import {median, note, target} from './bench-tools.js';

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, '..', '..');
const cli = join(root, 'dist', 'bundle', 'evenecho.cjs');

const timeTool = existsSync('/usr/bin/time') ? '/usr/bin/time' : null;

/** One cold run of the bundled CLI: wall, and CPU (user + system) when /usr/bin/time is there. */
function runCli(args: readonly string[], env: NodeJS.ProcessEnv): {wall: number; cpu: number | null; stdout: string} {
	const t0 = performance.now();
	const r = timeTool
		? spawnSync(timeTool, ['-f', '@@cpu %U %S', process.execPath, cli, ...args], {
				env,
				stdio: ['ignore', 'pipe', 'pipe'],
			})
		: spawnSync(process.execPath, [cli, ...args], {env, stdio: ['ignore', 'pipe', 'pipe']});
	const wall = performance.now() - t0;
	if (r.status !== 0)
		throw new Error(`evenecho ${args.join(' ')} exited ${r.status}: ${r.stderr.toString().slice(0, 400)}`);
	const m = /@@cpu ([\d.]+) ([\d.]+)/.exec(r.stderr.toString());
	return {wall, cpu: m ? (Number(m[1]) + Number(m[2])) * 1000 : null, stdout: r.stdout.toString()};
}

/** The invented plan: skin, 0.5 cm fat, 1 cm muscle, liver; 3.5 MHz, 16 cm display, 8 sliders. */
const planJson = {
	format: 'evenecho-plan/1',
	name: 'Bench patient, thin wall (invented)',
	region: 'upper-abdomen',
	layers: [
		{tissue: 'skin', thicknessCm: 0.2},
		{tissue: 'fat', thicknessCm: 0.5},
		{tissue: 'muscle', thicknessCm: 1},
		{tissue: 'liver', thicknessCm: 20},
	],
	probe: {centerMhz: 3.5, bandwidthFraction: 0.6},
	display: {depthCm: 16, assumedSpeedMps: 1540},
};

export async function run(): Promise<void> {
	console.log('\nrefine (600×480 demo patient DICOM, scanner profile)');
	const dir = mkdtempSync(join(tmpdir(), 'evenecho-refine-bench-'));
	const home = join(dir, 'home');
	const env = {...process.env, EVENECHO_HOME: home};
	try {
		const planPath = join(dir, 'plan.json');
		writeFileSync(planPath, JSON.stringify(planJson));
		runCli(
			[
				'simulate',
				planPath,
				'--out',
				join(dir, 'phantom'),
				'--kind',
				'phantom-series',
				'--format',
				'dicom',
				'--seed',
				'3',
			],
			env,
		);
		runCli(['scanner', 'calibrate', join(dir, 'phantom', 'session.json'), '--name', 'bench cart'], env);
		runCli(
			[
				'simulate',
				planPath,
				'--out',
				join(dir, 'patient'),
				'--kind',
				'patient',
				'--cyst',
				'--bright-line',
				'--format',
				'dicom',
				'--seed',
				'5',
			],
			env,
		);
		const measuredPlan = join(dir, 'plan-cart.json');
		writeFileSync(measuredPlan, JSON.stringify({...planJson, scanner: 'bench-cart'}));
		const image = join(dir, 'patient', 'patient.dcm');
		const args = [
			'refine',
			image,
			'--plan',
			measuredPlan,
			'--applied',
			join(dir, 'patient', 'applied-settings.json'),
			'--format',
			'json',
		];
		const first = runCli(args, env);
		const result = JSON.parse(first.stdout) as {
			attenuation: {alphaDbPerCmMhz: number; low: number; high: number} | null;
			calibrated: boolean;
		};
		const runs = Array.from({length: 7}, () => runCli(args, env));
		const walls = runs.map((r) => r.wall);
		const cpus = runs.flatMap((r) => (r.cpu === null ? [] : [r.cpu]));
		const a = result.attenuation;
		note(
			'result',
			`calibrated ${result.calibrated}, liver α0 ${a ? `${a.alphaDbPerCmMhz} (${a.low}–${a.high})` : 'not measured'}, truth 0.8`,
		);
		const wall = median(walls);
		const cpu = cpus.length ? `, CPU ${median(cpus).toFixed(0)} ms` : '';
		target(
			'`refine --scanner` cold process, wall (median of 7)',
			`${wall.toFixed(0)} ms${cpu}`,
			'≤ 1000 ms',
			wall <= 1000,
		);
		note(
			'load average while measured',
			loadavg()
				.map((l) => l.toFixed(1))
				.join(' '),
		);

		// The split, in this process, warm: the same work as the command, stage by stage.
		const parsed = parsePlan(planJson);
		if (!parsed.ok) throw new Error(parsed.errors.join('; '));
		const profile = openScannerProfileStore(home).get('bench-cart');
		const plan = resolvePlan(parsed.value.doc, scannerResponseOf(profile));
		const reading = profileReading(profile);
		const split: Record<'read' | RefineStage, number[]> = {read: [], bands: [], attenuation: [], sliders: []};
		for (let i = 0; i < 6; i++) {
			const t0 = performance.now();
			const still = readImageFile(image);
			const {frame, region} = frameFromImage(still);
			let last = performance.now();
			const readMs = last - t0;
			const times: Partial<Record<RefineStage, number>> = {};
			refineImage({
				frame,
				region,
				plan,
				levelMap: reading.levelMap,
				sliderTravelDb: reading.sliderTravelDb,
				onStage: (stage) => {
					const now = performance.now();
					times[stage] = now - last;
					last = now;
				},
			});
			if (i === 0) continue; // warm-up
			split.read.push(readMs);
			for (const stage of ['bands', 'attenuation', 'sliders'] as const) split[stage].push(times[stage] ?? Number.NaN);
		}
		const ms = (xs: number[]) => `${median(xs).toFixed(0)} ms`;
		note(
			'split, warm, in process (median of 5)',
			`read+decode ${ms(split.read)}, analysis (mask, bands) ${ms(split.bands)}, α0 fit ${ms(split.attenuation)}, slider ` +
				`refit ${ms(split.sliders)}`,
		);
	} finally {
		rmSync(dir, {recursive: true, force: true});
	}
}
