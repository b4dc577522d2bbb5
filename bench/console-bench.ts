/**
 * Console benchmark.
 * - Keystroke to frame: the console rendered in this process as it runs (same render options, a
 *   fake 100×30 terminal) on a 10-layer broadband plan; for each edit kind 200 presses, the time
 *   from writing the key to Ink writing the frame (wall) and the CPU this process spent in it.
 * - Memory: resident set of the real console process (the shipped bundle, in a pseudo-terminal)
 *   after 200 edits, one run per edit kind.
 */
import {execFile} from 'node:child_process';
import {EventEmitter} from 'node:events';
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {dirname, join} from 'node:path';
import {performance} from 'node:perf_hooks';
import {fileURLToPath} from 'node:url';
import {promisify} from 'node:util';
import {parsePlanDocument, type PlanDocument} from '../src/plan/plan-schema.js';
import {cpuMs, median, note, quantile, target} from './bench-tools.js';
import {inPty} from './pty-run.js';

const here = dirname(fileURLToPath(import.meta.url));
const cli = join(here, '..', 'bundle', 'evenecho.cjs');
const firstFrameMarker = '[1 Starting plan]';
const execFileAsync = promisify(execFile);
const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/** Invented 10-layer abdominal wall and organs, broadband probe (not a real patient). */
export function tenLayerDoc(): PlanDocument {
	const r = parsePlanDocument({
		name: 'Bench: ten layers, broadband',
		region: 'upper-abdomen',
		layers: [
			{tissue: 'skin', thicknessCm: 0.2},
			{tissue: 'fat', thicknessCm: 4},
			{tissue: 'muscle', thicknessCm: 1.2},
			{tissue: 'fat', thicknessCm: 0.8},
			{tissue: 'liver', thicknessCm: 4},
			{tissue: 'blood', thicknessCm: 1},
			{tissue: 'liver', thicknessCm: 3},
			{tissue: 'kidney', thicknessCm: 4},
			{tissue: 'muscle', thicknessCm: 2},
			{tissue: 'soft-tissue', thicknessCm: 10},
		],
		probe: {centerMhz: 3.5, bandwidthFraction: 1},
		display: {depthCm: 20},
		sliders: {count: 12},
		noiseBudgetDb: 80,
	});
	if (!r.ok) throw new Error(r.errors.join('; '));
	return r.value;
}

/** One kind of edit: keys that get there, then presses alternating between two keys. */
interface EditKind {
	readonly name: string;
	readonly setup: readonly string[];
	readonly press: readonly [string, string];
	/** The selected row's label after the setup keys (checked: the row order has changed before). */
	readonly row?: string;
}

const editKinds: readonly EditKind[] = [
	{name: 'centre frequency +/-', setup: ['3'], press: ['+', '-'], row: 'Centre frequency'},
	{name: 'fat layer thickness +/-', setup: ['2'], press: ['+', '-'], row: 'Fat, measured on screen'},
	// Step 3's eleventh row (until this was checked, six presses of j reached the display depth).
	{name: 'slider count +/-', setup: ['3', ...Array<string>(10).fill('j')], press: ['+', '-'], row: 'Slider count'},
	// The simulated picture shown, then hidden, then shown: each press draws or drops the whole picture.
	{name: 'picture shown / hidden (p)', setup: [], press: ['p', 'p']},
];
const pressesPerKind = 200;

/** The keys of 200 edits of one kind, for the memory reading of the real process. */
function twoHundredEdits(kind: EditKind): string[] {
	return [...kind.setup, ...Array.from({length: pressesPerKind}, (_, i) => kind.press[i % 2]!)];
}

/** A terminal for Ink: a TTY of fixed size that tells when something is written. */
class BenchStdout extends EventEmitter {
	readonly isTTY = true;
	readonly columns = 100;
	readonly rows = 30;
	onWrite: (() => void) | undefined;
	/** The last frame written (Ink also writes cursor codes on their own). */
	last = '';
	write = (chunk: string) => {
		if (String(chunk).includes('\n')) this.last = String(chunk);
		this.onWrite?.();
		return true;
	};
}

/** A frame's text without its colour and cursor codes. */
const plainText = (frame: string) => frame.replace(/\u001B\[[0-9;?]*[A-Za-z]/g, '');

class BenchStdin extends EventEmitter {
	readonly isTTY = true;
	private pending: string | null = null;
	setEncoding() {}
	setRawMode() {}
	resume() {}
	pause() {}
	ref() {}
	unref() {}
	read = () => {
		const data = this.pending;
		this.pending = null;
		return data;
	};
	press(data: string) {
		this.pending = data;
		this.emit('readable');
	}
}

interface Press {
	readonly wall: number;
	readonly cpu: number;
}

/** Set in the child process that measures key presses (see keystrokeToFrame). */
const childFlag = 'EVENECHO_BENCH_KEYSTROKE_CHILD';
const resultPrefix = 'key presses: ';

/** Every edit kind's presses, in this process; a press without a frame within 1 s has null times. */
async function measurePresses(): Promise<{readonly kind: string; readonly presses: (Press | null)[]}[]> {
	(await import('../src/ui/render-options.js')).tuneProcessForConsole();
	const [{render}, {createElement}, {App}, {shelfOver}, {colourTheme}, {consoleRenderOptions}] = await Promise.all([
		import('ink'),
		import('react'),
		import('../src/ui/app.js'),
		import('../src/ui/effects/preset-shelf.js'),
		import('../src/ui/kit/theme.js'),
		import('../src/ui/render-options.js'),
	]);
	const out: {kind: string; presses: (Press | null)[]}[] = [];
	for (const kind of editKinds) {
		const stdout = new BenchStdout();
		const stdin = new BenchStdin();
		const instance = render(
			// The colour theme and picture cells the shipped console draws in a colour terminal (the plain
			// theme draws the picture as shading characters, a fraction of the escapes Ink has to parse).
			createElement(App, {shelf: shelfOver(undefined), theme: colourTheme, initialPlan: tenLayerDoc()}),
			{
				...consoleRenderOptions,
				stdout: stdout as unknown as NodeJS.WriteStream,
				stdin: stdin as unknown as NodeJS.ReadStream,
				stderr: stdout as unknown as NodeJS.WriteStream,
				patchConsole: false,
			},
		);
		await sleep(200);
		const pressAndWait = (key: string) =>
			new Promise<Press | null>((resolve) => {
				const c0 = cpuMs();
				const t0 = performance.now();
				const timeout = setTimeout(() => resolve(null), 1000);
				stdout.onWrite = () => {
					stdout.onWrite = undefined;
					clearTimeout(timeout);
					resolve({wall: performance.now() - t0, cpu: cpuMs() - c0});
				};
				stdin.press(key);
			});
		for (const key of kind.setup) {
			await pressAndWait(key);
			await sleep(30);
		}
		if (kind.row && !plainText(stdout.last).includes(`> ${kind.row}`))
			throw new Error(`${kind.name}: the setup keys did not select the row "${kind.row}"`);
		// A few presses to warm the JIT on this path, not counted.
		for (let i = 0; i < 10; i++) {
			await pressAndWait(kind.press[i % 2]!);
			await sleep(25);
		}
		const presses: (Press | null)[] = [];
		for (let i = 0; i < pressesPerKind; i++) {
			presses.push(await pressAndWait(kind.press[i % 2]!));
			await sleep(25);
		}
		instance.unmount();
		out.push({kind: kind.name, presses});
	}
	return out;
}

/**
 * Measured in a fresh Node process: the console tunes V8's heap at start-up, and a process that
 * has already run other suites has a grown heap (its young generation at 2 × 16 MB instead of the
 * console's 2 × 8 MB), which made key presses look cheaper than in the console.
 */
async function keystrokeToFrame(): Promise<void> {
	const {CI: _ci, ...env} = process.env;
	const {stdout} = await execFileAsync(process.execPath, [fileURLToPath(import.meta.url)], {
		env: {...env, [childFlag]: '1'},
		maxBuffer: 16 * 1024 * 1024,
	});
	// On one line of its own: the terminal library may add a cursor escape to stdout on exit.
	const line = stdout.split('\n').find((l) => l.startsWith(resultPrefix));
	if (!line) throw new Error(`the key-press child printed no result: ${JSON.stringify(stdout.slice(-300))}`);
	const kinds = JSON.parse(line.slice(resultPrefix.length)) as Awaited<ReturnType<typeof measurePresses>>;
	const all: (Press | null)[] = [];
	for (const {kind, presses} of kinds) {
		const framed = presses.filter((g): g is Press => g !== null);
		const missed = presses.length - framed.length;
		note(
			`${kind} (${pressesPerKind} presses${missed ? `, ${missed} without a frame` : ''})`,
			`wall p50 ${quantile(
				framed.map((g) => g.wall),
				0.5,
			).toFixed(1)} ms, p95 ${quantile(
				framed.map((g) => g.wall),
				0.95,
			).toFixed(1)} ms; CPU median ${median(framed.map((g) => g.cpu)).toFixed(1)} ms`,
		);
		all.push(...presses);
	}
	const framed = all.filter((g): g is Press => g !== null);
	const p95 = quantile(
		framed.map((g) => g.wall),
		0.95,
	);
	const cpu = median(framed.map((g) => g.cpu));
	const missed = all.length - framed.length;
	target(
		`keystroke → frame, 10-layer broadband plan, every edit kind (${all.length} presses${missed ? `, ${missed} without a frame` : ''})`,
		`p95 ${p95.toFixed(1)} ms, median CPU ${cpu.toFixed(1)} ms`,
		'p95 ≤ 16 ms, median CPU ≤ 6 ms',
		p95 <= 16 && cpu <= 6 && missed === 0,
	);
}

async function memoryAfterEdits(): Promise<void> {
	const home = mkdtempSync(join(tmpdir(), 'evenecho-bench-'));
	const {CI: _ci, NO_COLOR: _nc, ...base} = process.env;
	const env = {...base, EVENECHO_HOME: home, TERM: 'xterm-256color'};
	const runs: {kind: string; firstMb?: number; peakMb?: number; editedMb?: number}[] = [];
	try {
		for (const kind of editKinds) {
			const r = await inPty(`${process.execPath} ${cli}`, env, {
				marker: firstFrameMarker,
				keys: twoHundredEdits(kind),
				gapMs: 30,
			});
			runs.push({kind: kind.name, ...r});
		}
	} finally {
		rmSync(home, {recursive: true, force: true});
	}
	const read = runs.filter((r) => r.editedMb !== undefined);
	if (!read.length) return note('console resident memory', 'not read (no /proc)');
	for (const r of read) {
		note(
			`console resident memory, ${r.kind}, after ${pressesPerKind} presses`,
			`${r.editedMb!.toFixed(0)} MB (first frame ${r.firstMb?.toFixed(0)} MB, peak ${r.peakMb?.toFixed(0)} MB)`,
		);
	}
	const edited = Math.max(...read.map((r) => r.editedMb!));
	target(
		`console resident memory after ${pressesPerKind} edits (worst edit kind)`,
		`${edited.toFixed(0)} MB`,
		'≤ 110 MB',
		edited <= 110,
	);
}

export async function run(): Promise<void> {
	console.log('\nconsole');
	// Ink writes only the last frame when it thinks it runs in CI.
	delete process.env['CI'];
	await memoryAfterEdits();
	await keystrokeToFrame();
}

// The child that measures key presses prints them as JSON and ends (Ink keeps the process alive otherwise).
if (process.env[childFlag] === '1') {
	process.stdout.write(`${resultPrefix}${JSON.stringify(await measurePresses())}\n`, () => process.exit(0));
}
