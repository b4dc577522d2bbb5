/**
 * Cold starts of the shipped bundle against `node -e 0`, run in rounds (node, then each command)
 * so load drifts hit every side alike; the ratio is the median of the per-round ratios.
 */
import {spawnSync} from 'node:child_process';
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {dirname, join} from 'node:path';
import {performance} from 'node:perf_hooks';
import {fileURLToPath} from 'node:url';
import {median, note, ratioList, target} from './bench-tools.js';
import {inPty} from './pty-run.js';

const here = dirname(fileURLToPath(import.meta.url));
const root = join(here, '..', '..');
const cli = join(root, 'dist', 'bundle', 'main.js');

/** CPU time (user + system) of one run of node with these arguments, ms; wall time is too noisy on a shared machine. */
function cpuOf(args: readonly string[], env: NodeJS.ProcessEnv): {cpu: number; wall: number} {
	const t0 = performance.now();
	const r = spawnSync('/usr/bin/time', ['-f', '@@time %U %S', process.execPath, ...args], {
		env,
		stdio: ['ignore', 'pipe', 'pipe'],
	});
	const wall = performance.now() - t0;
	const m = /@@time ([\d.]+) ([\d.]+)/.exec(r.stderr.toString());
	if (r.status !== 0 || !m)
		throw new Error(`${args.join(' ')} exited ${r.status}: ${r.stderr.toString().slice(0, 300)}`);
	return {cpu: (Number(m[1]) + Number(m[2])) * 1000, wall};
}

export async function run(): Promise<void> {
	console.log('\nstart-up (CPU time of the child process; rounds of node -e 0 then each command)');
	const home = mkdtempSync(join(tmpdir(), 'evenecho-bench-'));
	const {CI: _ci, NO_COLOR: _nc, ...base} = process.env;
	const env = {...base, EVENECHO_HOME: home, TERM: 'xterm-256color'};
	const commands: {name: string; args: string[]; targetRatio: number}[] = [
		{name: '`--version`', args: [cli, '--version'], targetRatio: 1.3},
		{name: '`--help`', args: [cli, '--help'], targetRatio: 1.3},
		{
			name: '`curve presets/upper-abdomen.json`',
			args: [cli, 'curve', join(root, 'presets', 'upper-abdomen.json')],
			targetRatio: 2,
		},
	];
	const rounds = 9;
	const bare: number[] = [];
	const ratios = commands.map((): number[] => []);
	const times = commands.map((): number[] => []);
	try {
		cpuOf(['-e', '0'], env);
		for (const c of commands) cpuOf(c.args, env);
		const walls = commands.map((): number[] => []);
		const bareWall: number[] = [];
		for (let i = 0; i < rounds; i++) {
			const b = cpuOf(['-e', '0'], env);
			bare.push(b.cpu);
			bareWall.push(b.wall);
			commands.forEach((c, k) => {
				const ms = cpuOf(c.args, env);
				times[k]!.push(ms.cpu);
				walls[k]!.push(ms.wall / b.wall);
				ratios[k]!.push(ms.cpu / b.cpu);
			});
		}
		note(
			`\`node -e 0\` (median of ${rounds})`,
			`${median(bare).toFixed(0)} ms CPU, ${median(bareWall).toFixed(0)} ms wall`,
		);
		commands.forEach((c, k) => {
			const r = median(ratios[k]!);
			target(
				`${c.name} cold start ÷ \`node -e 0\``,
				`${r.toFixed(2)}× in CPU time (${median(times[k]!).toFixed(0)} ms; rounds ${ratioList(ratios[k]!)}; wall ` +
					`${median(walls[k]!).toFixed(2)}×)`,
				`≤ ${c.targetRatio}×`,
				r <= c.targetRatio,
			);
		});

		// The console's first frame needs a terminal: both sides in the same pseudo-terminal.
		const node = process.execPath;
		await inPty(`${node} -e 0`, env);
		await inPty(`${node} ${cli}`, env, {marker: '[1 Starting plan]'});
		const consoleRatios: number[] = [];
		for (let i = 0; i < 5; i++) {
			const b = (await inPty(`${node} -e 0`, env)).ms;
			consoleRatios.push((await inPty(`${node} ${cli}`, env, {marker: '[1 Starting plan]'})).ms / b);
		}
		const r = median(consoleRatios);
		target(
			'console cold start to first frame ÷ `node -e 0` (pseudo-terminal)',
			`${r.toFixed(1)}× (rounds ${ratioList(consoleRatios)})`,
			'≤ 6×',
			r <= 6,
		);
	} finally {
		rmSync(home, {recursive: true, force: true});
	}
}
