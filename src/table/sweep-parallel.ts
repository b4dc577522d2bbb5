/**
 * Runs a protocol-table sweep on every core. With two threads the worker works out the rows' physics
 * and this thread fits them (see streamSweepInParallel for why); with more, this thread and the
 * workers each take whole row groups (rows that differ only in frequency, so each frequency ladder is
 * climbed once, by one of them). Either way this thread hands the rows on in order as they become
 * ready. Small sweeps, or a build without the worker file (the TypeScript sources under test), run on
 * this thread alone, as runSweep does.
 */
import {existsSync} from 'node:fs';
import {availableParallelism} from 'node:os';
import {fileURLToPath} from 'node:url';
import {Worker} from 'node:worker_threads';
import type {ResolvedSweep} from './sweep-spec.js';
import {
	referenceFitOf,
	rowSpots,
	rowsPerFrequency,
	rowValues,
	sweepRows,
	type LadderCache,
	tableOf,
	tableRow,
	type ProtocolTable,
	type RowPhysics,
	type RowSpot,
	type RowValues,
	climbLadder,
	type FitMemories,
	fitMemoryOf,
	type HighestReaching,
	highestReaching,
	rowPhysics,
	rowFromPhysics,
	rowGroup,
	rowPlan,
	type RunOptions,
	type TableRow,
} from './sweep-runner.js';
import {
	isWorkersRow,
	ladderClaim,
	physicsProgress,
	rowsPerClaim,
	rowsPerReply,
	type SweepJob,
	unpackedPhysics,
	type WorkerReply,
} from './sweep-worker.js';
import {sampleDepths} from '../engine/compensation-curve.js';

/** Below this many rows the threads' start-up (~0.1 s each) costs more than they save. */
const minRowsForThreads = 400;

export interface ParallelOptions extends RunOptions {
	/** Worker threads to use, whatever the sweep's size. @default the cores available (at most 8), none for small sweeps */
	readonly threads?: number;
}

const workerFile = fileURLToPath(new URL('./sweep-worker.js', import.meta.url));

/** Receives a sweep's rows in row order, a batch at a time; a returned promise holds the sweep back (a full pipe). */
export type RowSink = (rows: readonly TableRow[]) => void | Promise<void>;

/** A sweep's table without its rows: what the formats write before the first row. */
export function tableFrame(sweep: ResolvedSweep): ProtocolTable {
	return tableOf(sweep, [], referenceFitOf(sweep));
}

/** Runs a checked sweep on worker threads; the same rows, in the same order, as runSweep. */
export async function runSweepInParallel(sweep: ResolvedSweep, options: ParallelOptions = {}): Promise<ProtocolTable> {
	const frame = tableFrame(sweep);
	const rows: TableRow[] = [];
	await streamSweepInParallel(frame, options, (batch) => {
		rows.push(...batch);
	});
	return {...frame, rows};
}

/**
 * Runs the sweep of a {@link tableFrame} on worker threads and hands its rows to `sink` in row
 * order as soon as they are ready; rows that arrive ahead of their turn wait here, and nothing is
 * kept once handed on, so a 20,000-row table is never in memory whole.
 */
export async function streamSweepInParallel(
	frame: ProtocolTable,
	options: ParallelOptions,
	sink: RowSink,
): Promise<void> {
	const sweep = frame.sweep;
	const reference = frame.reference;
	// More threads than row groups would leave some idle (a group never splits: its ladder is shared).
	const threads = Math.min(options.threads ?? Math.min(8, availableParallelism()), rowsPerFrequency(sweep));
	const small = options.threads === undefined && sweep.rowCount < minRowsForThreads;
	if (threads < 2 || small || !existsSync(workerFile)) {
		let batch: TableRow[] = [];
		for (const row of sweepRows(sweep, reference, options)) {
			batch.push(row);
			if (batch.length >= rowsPerReply) {
				await sink(batch);
				batch = [];
			}
		}
		if (batch.length) await sink(batch);
		return;
	}

	// With two threads the worker works out rows' physics and this thread fits them: each half of the
	// engine is then compiled by one thread only. Its JIT warm-up (~1.6 s of CPU per thread on a
	// 10,000-row table, against ~2 s for the rows themselves once warm) was paid twice when both
	// threads computed whole rows. Whenever this thread has nothing to fit it climbs a frequency ladder
	// nobody has claimed, or works out the physics of the next rows itself: how the work splits then
	// follows the sweep (a tissue-harmonic row's physics costs many fundamental ones). With more
	// threads this thread alone could not keep up with the fits, so each computes whole rows as before.
	const pipeline = threads === 2;
	// Rows (or their physics) received but not yet handed on, by row number; `next` is the next row to hand on.
	const waiting = new Map<number, RowValues | RowPhysics>();
	const spots = [...rowSpots(sweep)];
	let next = 1;
	let done = 0;
	let wake: (() => void) | undefined;
	const take = (reply: WorkerReply) => {
		for (const [index, v] of reply.rows) waiting.set(index, v);
		if (!pipeline) {
			done += reply.rows.length;
			options.onProgress?.(done, sweep.rowCount);
		}
		wake?.();
	};
	const keepCurves = options.keepCurves === true;
	const progress = pipeline ? new Int32Array(new SharedArrayBuffer(4 * physicsProgress.length)) : undefined;
	// The sample depths the worker leaves out of each row's physics (a sweep never changes the display).
	const depths = sampleDepths(sweep.doc.display.depthCm, sweep.stepCm);
	const ladders: LadderCache = new Map();
	const memories: FitMemories = new Map();
	const groups = rowsPerFrequency(sweep);
	const ladderClaims = new Int32Array(new SharedArrayBuffer(4 * (pipeline ? groups : 0)));
	// The highest-reaching frequency of each row group (its rows share a ladder), whoever climbed it.
	// Every group's first row comes before its other rows, and brings it.
	const highestByGroup = new Map<number, HighestReaching>();
	const fitted = (spot: RowSpot, physics: RowPhysics): RowValues => {
		const plan = rowPlan(sweep, spot);
		const group = rowGroup(sweep, spot.index);
		let highest = physics.highest ?? highestByGroup.get(group);
		if (!highest) {
			// Not climbed yet (or claimed by the worker for a later row of the group): climb it here.
			Atomics.compareExchange(ladderClaims, group, ladderClaim.free, ladderClaim.main);
			highest = highestReaching(sweep, plan, physics.targetDepthCm, ladders);
		}
		highestByGroup.set(group, highest);
		const memory = fitMemoryOf(memories, sweep, spot);
		return rowFromPhysics(unpackedPhysics(physics, depths), highest, plan, keepCurves, memory);
	};
	const handOn = async () => {
		let batch: TableRow[] = [];
		const flush = async () => {
			if (pipeline) {
				done += batch.length;
				options.onProgress?.(done, sweep.rowCount);
				// The worker may now run further ahead (SweepJob.progress).
				Atomics.store(progress!, physicsProgress.handedOn, next - 1);
				Atomics.notify(progress!, physicsProgress.handedOn);
			}
			await sink(batch);
			batch = [];
		};
		while (waiting.has(next)) {
			const spot = spots[next - 1]!;
			const got = waiting.get(next)!;
			waiting.delete(next++);
			batch.push(tableRow(sweep, spot, pipeline ? fitted(spot, got as RowPhysics) : (got as RowValues), reference));
			if (pipeline && batch.length >= rowsPerReply) await flush();
		}
		if (batch.length) await flush();
	};
	// Ladders nobody has claimed, from the last group down (the worker meets them from the first up).
	let lastGroup = groups - 1;
	const climbAhead = (): boolean => {
		while (lastGroup >= 0) {
			const group = lastGroup--;
			if (Atomics.compareExchange(ladderClaims, group, ladderClaim.free, ladderClaim.main) === ladderClaim.free) {
				highestByGroup.set(group, climbLadder(sweep, spots[group]!, ladders));
				return true;
			}
		}
		return false;
	};
	// The physics of the next rows nobody has claimed, worked out here.
	const physicsAhead = (): boolean => {
		const first = Atomics.add(progress!, physicsProgress.claimed, rowsPerClaim);
		if (first >= sweep.rowCount) return false;
		for (let i = first; i < Math.min(first + rowsPerClaim, sweep.rowCount); i++)
			waiting.set(i + 1, rowPhysics(sweep, spots[i]!));
		return true;
	};
	const jobs: SweepJob[] = pipeline
		? [{sweep, worker: 0, workers: 1, keepCurves, part: 'physics', progress, ladderClaims}]
		: // This thread takes share 0 itself: one heap fewer than a worker per share (~40 MB each).
			Array.from({length: threads - 1}, (_, k) => ({
				sweep,
				worker: k + 1,
				workers: threads,
				keepCurves,
				part: 'whole',
			}));
	const workers = jobs.map(
		(job) =>
			new Promise<void>((resolve, reject) => {
				// A worker keeps little alive (its ladders, one batch of rows: ~11 MB at the end of a 10,000-row
				// sweep), but with no limit V8 lets its heap grow to three times that; 48 MB keeps a 4× margin.
				// Its garbage is short-lived row arithmetic: a 4 MB young generation spent a fifth of the
				// worker's time collecting it. 12 MB made a 10,000-row table ~15 % faster; 16 MB was no faster
				// and held the 20,000-row JSON table at 154–161 MB against 147–150 MB (peak resident).
				const limits = {maxYoungGenerationSizeMb: 12, maxOldGenerationSizeMb: 48};
				const w = new Worker(workerFile, {workerData: job, resourceLimits: limits});
				w.on('message', take);
				w.on('error', reject);
				w.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`sweep worker stopped with code ${code}`))));
			}),
	);
	let finished = false;
	const allWorkers = Promise.all(workers).then(() => {
		finished = true;
	});
	// Awaited below; until then a failing worker must not count as an unhandled rejection.
	allWorkers.catch(() => {});
	if (!pipeline) {
		let mine: [number, RowValues][] = [];
		for (const spot of spots) {
			if (!isWorkersRow(sweep, spot.index, 0, threads)) continue;
			mine.push([spot.index, rowValues(sweep, spot, ladders, memories, keepCurves)]);
			if (mine.length >= rowsPerReply) {
				take({rows: mine});
				mine = [];
				await handOn();
				// Let the workers' replies (and the progress bar) in between batches.
				await new Promise<void>((resolve) => setImmediate(resolve));
			}
		}
		take({rows: mine});
	}
	for (;;) {
		await handOn();
		if (next > sweep.rowCount) break;
		if (pipeline) {
			// Take in the replies already sent. Nothing to fit still, and the worker has no more than the
			// rows it is on in hand (it is behind, not just between two replies): climb a ladder, or work
			// out the next rows' physics here.
			await new Promise<void>((resolve) => setImmediate(resolve));
			if (waiting.has(next)) continue;
			const inHand = Atomics.load(progress!, physicsProgress.claimed) - (next - 1);
			if (inHand <= rowsPerClaim && (climbAhead() || physicsAhead())) continue;
		}
		if (finished) break;
		await Promise.race([allWorkers, new Promise<void>((resolve) => (wake = resolve))]);
	}
	await allWorkers;
	await handOn();
	if (next <= sweep.rowCount) throw new Error(`sweep worker left row ${next} out`);
}
