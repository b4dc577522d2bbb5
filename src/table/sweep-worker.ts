/**
 * A worker thread of {@link runSweepInParallel}: works out its share of a sweep's rows (whole groups
 * of rows that differ only in frequency) and posts them in batches: whole rows, or only their physics
 * for the main thread to fit (sweep-parallel.ts says when).
 */
import {parentPort, workerData} from 'node:worker_threads';
import type {ResolvedSweep} from './sweep-spec.js';
import {
	type LadderCache,
	type RowPhysics,
	rowPhysics,
	rowSpots,
	rowsPerFrequency,
	rowValues,
	type RowValues,
} from './sweep-runner.js';

export interface SweepJob {
	readonly sweep: ResolvedSweep;
	/** This worker's number (0-based) and how many share the rows. */
	readonly worker: number;
	readonly workers: number;
	readonly keepCurves: boolean;
	/** Whole rows, or only their physics (the main thread fits them). */
	readonly part: 'whole' | 'physics';
}

export interface WorkerReply {
	/** Row number (1-based) and values, or physics as {@link packedPhysics} sends it. */
	readonly rows: readonly (readonly [number, RowValues | RowPhysics])[];
}

/**
 * Whether a row is this worker's: whole groups of rows that differ only in frequency, dealt out in
 * turn, so every frequency ladder is climbed by one worker only.
 */
export function isWorkersRow(sweep: ResolvedSweep, index: number, worker: number, workers: number): boolean {
	const groups = rowsPerFrequency(sweep);
	return ((index - 1) % groups) % workers === worker;
}

/** Rows per message: few enough messages to cost nothing, often enough for the progress bar. */
export const rowsPerReply = 50;

/**
 * A row's physics as sent between threads: the sample depths (the same for every row of a sweep)
 * stay behind, and the compensation goes as one typed array (copied at once, not number by number).
 */
export function packedPhysics(p: RowPhysics): RowPhysics {
	return {...p, facts: {...p.facts, depths: [], compensationDb: Float64Array.from(p.facts.compensationDb)}};
}

/** {@link packedPhysics} undone: the depths put back. */
export function unpackedPhysics(p: RowPhysics, depths: readonly number[]): RowPhysics {
	return {...p, facts: {...p.facts, depths}};
}

if (parentPort && (workerData as SweepJob | undefined)?.sweep) {
	const {sweep, worker, workers, keepCurves, part} = workerData as SweepJob;
	const ladders: LadderCache = new Map();
	let rows: [number, RowValues | RowPhysics][] = [];
	for (const spot of rowSpots(sweep)) {
		if (!isWorkersRow(sweep, spot.index, worker, workers)) continue;
		rows.push([
			spot.index,
			part === 'physics'
				? packedPhysics(rowPhysics(sweep, spot, ladders))
				: rowValues(sweep, spot, ladders, keepCurves),
		]);
		if (rows.length >= rowsPerReply) {
			parentPort.postMessage({rows} satisfies WorkerReply);
			rows = [];
		}
	}
	if (rows.length) parentPort.postMessage({rows} satisfies WorkerReply);
}
