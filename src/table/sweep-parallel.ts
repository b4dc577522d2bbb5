/**
 * Runs a protocol-table sweep on every core: this thread and worker threads each take whole row
 * groups (rows that differ only in frequency, so each frequency ladder is climbed once, by one of
 * them); the workers send back plain row values and this thread puts the rows in order. Small sweeps, or a build without the worker
 * file (the TypeScript sources under test), run on this thread with {@link runSweep}.
 */
import {existsSync} from 'node:fs';
import {availableParallelism} from 'node:os';
import {fileURLToPath} from 'node:url';
import {Worker} from 'node:worker_threads';
import {settingsOf} from '../engine/plan-difference.js';
import type {ResolvedSweep} from './sweep-spec.js';
import {
	referenceFitOf,
	rowSpots,
	rowsPerFrequency,
	rowValues,
	type LadderCache,
	runSweep,
	tableOf,
	tableRow,
	type ProtocolTable,
	type RowValues,
	type RunOptions,
	type TableRow,
} from './sweep-runner.js';
import {isWorkersRow, rowsPerReply, type SweepJob, type WorkerReply} from './sweep-worker.js';

/** Below this many rows the threads' start-up (~0.1 s each) costs more than they save. */
const minRowsForThreads = 400;

export interface ParallelOptions extends RunOptions {
	/** Worker threads to use, whatever the sweep's size. @default the cores available (at most 8), none for small sweeps */
	readonly threads?: number;
}

const workerFile = fileURLToPath(new URL('./sweep-worker.js', import.meta.url));

/** Runs a checked sweep on worker threads; the same rows, in the same order, as {@link runSweep}. */
export async function runSweepInParallel(sweep: ResolvedSweep, options: ParallelOptions = {}): Promise<ProtocolTable> {
	// More threads than row groups would leave some idle (a group never splits: its ladder is shared).
	const threads = Math.min(options.threads ?? Math.min(8, availableParallelism()), rowsPerFrequency(sweep));
	const small = options.threads === undefined && sweep.rowCount < minRowsForThreads;
	if (threads < 2 || small || !existsSync(workerFile)) return runSweep(sweep, options);

	const referenceFit = referenceFitOf(sweep);
	const reference = settingsOf(referenceFit);
	const values: (RowValues | undefined)[] = new Array(sweep.rowCount);
	let done = 0;
	const take = (reply: WorkerReply) => {
		for (const [index, v] of reply.rows) values[index - 1] = v;
		done += reply.rows.length;
		options.onProgress?.(done, sweep.rowCount);
	};
	const keepCurves = options.keepCurves === true;
	// This thread takes share 0 itself: one heap fewer than a worker per share (~40 MB each).
	const workers = Array.from({length: threads - 1}, (_, k) => {
		const job: SweepJob = {sweep, worker: k + 1, workers: threads, keepCurves};
		return new Promise<void>((resolve, reject) => {
			const w = new Worker(workerFile, {workerData: job, resourceLimits: {maxYoungGenerationSizeMb: 4}});
			w.on('message', take);
			w.on('error', reject);
			w.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`sweep worker stopped with code ${code}`))));
		});
	});
	const ladders: LadderCache = new Map();
	let mine: [number, RowValues][] = [];
	for (const spot of rowSpots(sweep)) {
		if (!isWorkersRow(sweep, spot.index, 0, threads)) continue;
		mine.push([spot.index, rowValues(sweep, spot, ladders, keepCurves)]);
		if (mine.length >= rowsPerReply) {
			take({rows: mine});
			mine = [];
			// Let the workers' replies (and the progress bar) in between batches.
			await new Promise<void>((resolve) => setImmediate(resolve));
		}
	}
	take({rows: mine});
	await Promise.all(workers);

	const rows: TableRow[] = [];
	for (const spot of rowSpots(sweep)) {
		const v = values[spot.index - 1];
		if (!v) throw new Error(`sweep worker left row ${spot.index} out`);
		rows.push(tableRow(sweep, spot, v, reference));
	}
	return tableOf(sweep, rows, referenceFit);
}
