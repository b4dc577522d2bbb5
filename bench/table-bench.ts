/**
 * Protocol-table benchmark, through the command as users run it: a 10,000-row sweep (100 habitus ×
 * 50 frequencies × 2 receive modes) of the upper-abdomen template, this tree's bundle against the
 * pinned build's command, alternated, output written to a file; then both outputs compared. And the
 * resident memory of the largest allowed table (20,000 rows) written as JSON.
 */
import {spawnSync} from 'node:child_process';
import {mkdtempSync, readFileSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {dirname, join} from 'node:path';
import {fileURLToPath} from 'node:url';
import {median, note, ratioList, target} from './bench-tools.js';
import type {PinnedBuild} from './pinned-build.js';

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, '..', '..');
const cli = join(root, 'dist', 'bundle', 'main.js');
const plan = join(root, 'presets', 'upper-abdomen.json');

interface Timed {
	readonly wallS: number;
	readonly cpuS: number;
	readonly peakMb: number;
}

/** Runs `node <entry> table …` under /usr/bin/time, stdout to a file; wall, CPU and peak resident set. */
function timedTable(entry: string, args: readonly string[], outFile: string, env: NodeJS.ProcessEnv): Timed {
	const r = spawnSync(
		'/usr/bin/time',
		[
			'-f',
			'@@time %e %U %S %M',
			'sh',
			'-c',
			`exec "$0" "$@" > "${outFile}"`,
			process.execPath,
			entry,
			'table',
			plan,
			...args,
		],
		{
			env,
			stdio: ['ignore', 'ignore', 'pipe'],
			maxBuffer: 1 << 24,
		},
	);
	const err = r.stderr.toString();
	const m = /@@time ([\d.]+) ([\d.]+) ([\d.]+) (\d+)/.exec(err);
	if (r.status !== 0 || !m) throw new Error(`table run failed (${r.status}): ${err.slice(0, 400)}`);
	return {wallS: Number(m[1]), cpuS: Number(m[2]) + Number(m[3]), peakMb: Number(m[4]) / 1024};
}

/**
 * Largest difference between two JSON documents of the same shape (numbers compared, the rest must
 * match), over the fields both documents have.
 */
function jsonDifference(a: unknown, b: unknown, path = ''): {max: number; where: string; mismatch?: string} {
	if (typeof a === 'number' && typeof b === 'number') return {max: Math.abs(a - b), where: path};
	if (Array.isArray(a) && Array.isArray(b) && a.length === b.length) {
		let worst = {max: 0, where: ''} as {max: number; where: string; mismatch?: string};
		a.forEach((x, i) => {
			const d = jsonDifference(x, b[i], `${path}[${i}]`);
			if (d.mismatch) worst = d.mismatch && !worst.mismatch ? d : worst;
			else if (!worst.mismatch && d.max > worst.max) worst = d;
		});
		return worst;
	}
	if (a && b && typeof a === 'object' && typeof b === 'object' && !Array.isArray(a) && !Array.isArray(b)) {
		// Only fields both builds write: a field added since the pinned build has nothing to compare with.
		const keys = Object.keys(a).filter((k) => Object.hasOwn(b, k));
		let worst = {max: 0, where: ''} as {max: number; where: string; mismatch?: string};
		for (const k of keys) {
			if (k === 'model' || k === 'version') continue;
			const d = jsonDifference((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`);
			if (d.mismatch && !worst.mismatch) worst = d;
			else if (!worst.mismatch && d.max > worst.max) worst = d;
		}
		return worst;
	}
	return a === b
		? {max: 0, where: path}
		: {
				max: 0,
				where: path,
				mismatch: `${path}: ${JSON.stringify(a)?.slice(0, 60)} vs ${JSON.stringify(b)?.slice(0, 60)}`,
			};
}

export async function run(pinned: PinnedBuild): Promise<void> {
	console.log('\nprotocol tables');
	const dir = mkdtempSync(join(tmpdir(), 'evenecho-bench-table-'));
	const {CI: _ci, ...env} = process.env;
	const before = join(pinned.distDir, 'src', 'cli', 'main.js');
	// Fundamental receive only: `both` once meant fundamental + the scatterer-harmonic model and now
	// means fundamental + tissue harmonic (a far costlier model the pinned build never computed), so
	// the two sides would not do the same work. 200 fat steps × 50 frequencies = 10,000 rows.
	const sweep = ['--fat', '0.25:50:0.25', '--freq', '2:11.8:0.2', '--receive', 'fundamental', '--format', 'json'];
	const pairs = Number(process.env['EVENECHO_BENCH_TABLE_PAIRS'] ?? 2);
	try {
		// Warm the file cache and both builds' module loading on a small sweep.
		const small = ['--fat', '1,2', '--freq', '3,4', '--format', 'json'];
		timedTable(before, small, join(dir, 'warm-a.json'), env);
		timedTable(cli, small, join(dir, 'warm-b.json'), env);
		const a: Timed[] = [];
		const b: Timed[] = [];
		for (let i = 0; i < pairs; i++) {
			a.push(timedTable(before, sweep, join(dir, 'before.json'), env));
			b.push(timedTable(cli, sweep, join(dir, 'now.json'), env));
		}
		const wallRatios = a.map((x, i) => x.wallS / b[i]!.wallS);
		const cpuRatios = a.map((x, i) => x.cpuS / b[i]!.cpuS);
		note(
			`pinned build ${pinned.commit}, 10,000 rows JSON (median of ${pairs})`,
			`${median(a.map((x) => x.wallS)).toFixed(1)} s wall, ${median(a.map((x) => x.cpuS)).toFixed(1)} s CPU, peak ` +
				`${median(a.map((x) => x.peakMb)).toFixed(0)} MB`,
		);
		note(
			'this tree, same table',
			`${median(b.map((x) => x.wallS)).toFixed(1)} s wall, ${median(b.map((x) => x.cpuS)).toFixed(1)} s CPU, peak ` +
				`${median(b.map((x) => x.peakMb)).toFixed(0)} MB; CPU ratios pinned ÷ now ${ratioList(cpuRatios)}`,
		);
		const speedup = median(wallRatios);
		target(
			'10,000-row table, wall time, pinned build ÷ this tree (alternated)',
			`${speedup.toFixed(2)}× faster (pairs ${ratioList(wallRatios)})`,
			'≥ 4×',
			speedup >= 4,
		);
		const d = jsonDifference(
			JSON.parse(readFileSync(join(dir, 'before.json'), 'utf8')),
			JSON.parse(readFileSync(join(dir, 'now.json'), 'utf8')),
		);
		target(
			'10,000-row table, largest difference from the pinned build (rounded outputs)',
			d.mismatch ? `differs: ${d.mismatch}` : `${d.max.toFixed(3)}${d.where ? ` at ${d.where}` : ''}`,
			'≤ 0.01 dB (one rounding step)',
			!d.mismatch && d.max <= 0.0100001,
		);
		rmSync(join(dir, 'before.json'));
		const largest = timedTable(
			cli,
			['--fat', '0.25:50:0.25', '--freq', '2:11.8:0.2', '--receive', 'both', '--format', 'json'],
			join(dir, 'largest.json'),
			env,
		);
		target(
			'20,000-row JSON table, peak resident memory',
			`${largest.peakMb.toFixed(0)} MB (${largest.wallS.toFixed(1)} s)`,
			'≤ 150 MB',
			largest.peakMb <= 150,
		);
	} finally {
		rmSync(dir, {recursive: true, force: true});
	}
}
