/**
 * A worker thread of {@link runSweepInParallel}: computes its share of a sweep's rows (whole groups
 * of rows that differ only in frequency) and posts their values in batches.
 */
import {parentPort, workerData} from 'node:worker_threads';
import type {ResolvedSweep} from './sweep-spec.js';
import {rowSpots, rowsPerFrequency, rowValues, type LadderCache, type RowValues} from './sweep-runner.js';

export interface SweepJob {
	readonly sweep: ResolvedSweep;
	/** This worker's number (0-based) and how many there are. */
	readonly worker: number;
	readonly workers: number;
	readonly keepCurves: boolean;
}

export interface WorkerReply {
	/** Row number (1-based) and values. */
	readonly rows: readonly (readonly [number, RowValues])[];
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

if (parentPort && (workerData as SweepJob | undefined)?.sweep) {
	const {sweep, worker, workers, keepCurves} = workerData as SweepJob;
	const ladders: LadderCache = new Map();
	let rows: [number, RowValues][] = [];
	for (const spot of rowSpots(sweep)) {
		if (!isWorkersRow(sweep, spot.index, worker, workers)) continue;
		rows.push([spot.index, rowValues(sweep, spot, ladders, keepCurves)]);
		if (rows.length >= rowsPerReply) {
			parentPort.postMessage({rows} satisfies WorkerReply);
			rows = [];
		}
	}
	if (rows.length) parentPort.postMessage({rows} satisfies WorkerReply);
}
