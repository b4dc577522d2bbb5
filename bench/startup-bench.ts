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
const cli = join(root, 'dist', 'bundle', 'evenecho.cjs');

type Clock = 'ticks' | 'fine';

/**
 * CPU time (user + system) of one run of node with these arguments, ms; wall time is too noisy on a
 * shared machine. Two clocks read the same kernel account of the child: GNU time prints user and
 * system to 10 ms each (`ticks`: `node -e 0` at 40 ms then moves a ratio by up to a quarter per
 * tick, and truncating both parts biases short runs low), bash's `times` prints them to 1 ms
 * (`fine`). Both are kept, measured in the same rounds, so a change of clock is seen beside the old one.
 */
function cpuOf(args: readonly string[], env: NodeJS.ProcessEnv, clock: Clock): {cpu: number; wall: number} {
	const t0 = performance.now();
	const [timer, ...timerArgs] =
		clock === 'ticks'
			? ['/usr/bin/time', '-f', '@@time %U %S']
			: ['bash', '-c', '"$@" >/dev/null; s=$?; times >&2; exit $s', 'bash'];
	const r = spawnSync(timer!, [...timerArgs, process.execPath, ...args], {env, stdio: ['ignore', 'pipe', 'pipe']});
	const wall = performance.now() - t0;
	const stderr = r.stderr.toString();
	// bash's `times`: the second line is the children's "user system", e.g. "0m0.081s 0m0.022s".
	const fine = /(\d+)m([\d.]+)s (\d+)m([\d.]+)s\s*$/.exec(stderr);
	const ticks = /@@time ([\d.]+) ([\d.]+)/.exec(stderr);
	if (r.status !== 0 || !(clock === 'ticks' ? ticks : fine))
		throw new Error(`${args.join(' ')} exited ${r.status}: ${stderr.slice(0, 300)}`);
	const seconds =
		clock === 'ticks'
			? Number(ticks![1]) + Number(ticks![2])
			: Number(fine![1]) * 60 + Number(fine![2]) + Number(fine![3]) * 60 + Number(fine![4]);
	return {cpu: seconds * 1000, wall};
}

export async function run(): Promise<void> {
	console.log(
		'\nstart-up (CPU time of the child process, 1 ms and 10 ms clocks; rounds of node -e 0 then each command)',
	);
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
	const clocks: readonly Clock[] = ['fine', 'ticks'];
	const bare = {fine: [] as number[], ticks: [] as number[]};
	const ratios = {fine: commands.map((): number[] => []), ticks: commands.map((): number[] => [])};
	const times = {fine: commands.map((): number[] => []), ticks: commands.map((): number[] => [])};
	try {
		for (const clock of clocks) {
			cpuOf(['-e', '0'], env, clock);
			for (const c of commands) cpuOf(c.args, env, clock);
		}
		const walls = commands.map((): number[] => []);
		const bareWall: number[] = [];
		for (let i = 0; i < rounds; i++) {
			// Each round reads both clocks, in turn first, so load drifts hit both alike.
			for (const clock of i % 2 ? [...clocks].reverse() : clocks) {
				const b = cpuOf(['-e', '0'], env, clock);
				bare[clock].push(b.cpu);
				if (clock === 'ticks') bareWall.push(b.wall);
				commands.forEach((c, k) => {
					const ms = cpuOf(c.args, env, clock);
					times[clock][k]!.push(ms.cpu);
					if (clock === 'ticks') walls[k]!.push(ms.wall / b.wall);
					ratios[clock][k]!.push(ms.cpu / b.cpu);
				});
			}
		}
		note(
			`\`node -e 0\` (median of ${rounds})`,
			`${median(bare.fine).toFixed(0)} ms CPU (1 ms clock), ${median(bare.ticks).toFixed(0)} ms (10 ms clock), ` +
				`${median(bareWall).toFixed(0)} ms wall`,
		);
		commands.forEach((c, k) => {
			const r = median(ratios.fine[k]!);
			target(
				`${c.name} cold start ÷ \`node -e 0\``,
				`${r.toFixed(2)}× in CPU time (${median(times.fine[k]!).toFixed(0)} ms; rounds ${ratioList(ratios.fine[k]!)}; ` +
					`10 ms clock ${median(ratios.ticks[k]!).toFixed(2)}×, ${median(times.ticks[k]!).toFixed(0)} ms; wall ` +
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
