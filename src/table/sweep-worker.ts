/**
 * A worker thread of {@link runSweepInParallel}: works out its share of a sweep's rows and posts them
 * in batches: whole rows of its whole row groups (rows that differ only in frequency), or the physics
 * of the rows it claims, for the main thread to fit (sweep-parallel.ts says when).
 */
import {parentPort, workerData} from 'node:worker_threads';
import type {ResolvedSweep} from './sweep-spec.js';
import {
	type FitMemories,
	highestReaching,
	type LadderCache,
	type RowPhysics,
	rowPhysics,
	rowPlan,
	type RowSpot,
	rowGroup,
	rowSpots,
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
	/**
	 * With `physics`: counters both threads see ({@link physicsProgress}). The rows are claimed
	 * {@link rowsPerClaim} at a time, in order, by whichever thread is free: this worker, or the main
	 * thread when it has nothing to fit.
	 */
	readonly progress?: Int32Array;
	/**
	 * With `physics`: who climbs each row group's frequency ladder (its rows share one), a flag per
	 * group ({@link ladderClaim}); each ladder is climbed once, by whichever thread claims it first.
	 */
	readonly ladderClaims?: Int32Array;
}

/** The flags of {@link SweepJob.ladderClaims}. */
export const ladderClaim = {free: 0, main: 1, worker: 2} as const;

/** The counters of {@link SweepJob.progress}: rows claimed (0-based, the next to claim) and rows handed on. */
export const physicsProgress = {claimed: 0, handedOn: 1, length: 2} as const;

/** Rows claimed at a time. */
export const rowsPerClaim = 10;

/**
 * How far the worker's physics may run ahead of the rows handed on: rows waiting to be fitted are
 * held in memory (about 2 kB each), so a worker faster than the fits waits rather than piling them up.
 */
const maxRowsAhead = 200;

export interface WorkerReply {
	/** Row number (1-based) and values, or physics as {@link packedPhysics} sends it. */
	readonly rows: readonly (readonly [number, RowValues | RowPhysics])[];
}

/**
 * Whether a row is this worker's: whole groups of rows that differ only in frequency, dealt out in
 * turn, so every frequency ladder is climbed by one worker only.
 */
export function isWorkersRow(sweep: ResolvedSweep, index: number, worker: number, workers: number): boolean {
	return rowGroup(sweep, index) % workers === worker;
}

/** Rows per message: few enough messages to cost nothing, often enough for the progress bar. */
export const rowsPerReply = 50;

/**
 * A row's physics as sent between threads: the sample depths (the same for every row of a sweep)
 * stay behind, and the compensation goes as one typed array (copied at once, not number by number).
 */
export function packedPhysics(p: RowPhysics): RowPhysics {
	return {...p, facts: {...p.facts, depths: [], compensationDb: new Float64Array(p.facts.compensationDb)}};
}

/** {@link packedPhysics} undone: the depths put back. */
export function unpackedPhysics(p: RowPhysics, depths: readonly number[]): RowPhysics {
	return {...p, facts: {...p.facts, depths}};
}

if (parentPort && (workerData as SweepJob | undefined)?.sweep) {
	const {sweep, worker, workers, keepCurves, part, progress, ladderClaims} = workerData as SweepJob;
	if (part === 'physics' && progress && ladderClaims) {
		const ladders: LadderCache = new Map();
		// The row's physics, with its ladder when this worker is the first to claim the group's.
		const physicsOf = (spot: RowSpot): RowPhysics => {
			const plan = rowPlan(sweep, spot);
			const physics = rowPhysics(sweep, spot, plan);
			const group = rowGroup(sweep, spot.index);
			if (Atomics.compareExchange(ladderClaims, group, ladderClaim.free, ladderClaim.worker) !== ladderClaim.free)
				return physics;
			return {...physics, highest: highestReaching(sweep, plan, physics.targetDepthCm, ladders)};
		};
		const spots = rowSpots(sweep);
		let at = 0;
		for (;;) {
			for (;;) {
				const handedOn = Atomics.load(progress, physicsProgress.handedOn);
				if (Atomics.load(progress, physicsProgress.claimed) - handedOn < maxRowsAhead) break;
				// Woken when the main thread hands rows on; the timeout only guards against a missed wake.
				Atomics.wait(progress, physicsProgress.handedOn, handedOn, 100);
			}
			const first = Atomics.add(progress, physicsProgress.claimed, rowsPerClaim);
			if (first >= sweep.rowCount) break;
			const rows: [number, RowPhysics][] = [];
			for (; at < first; at++) spots.next();
			for (; at < Math.min(first + rowsPerClaim, sweep.rowCount); at++) {
				const spot = spots.next().value!;
				rows.push([spot.index, packedPhysics(physicsOf(spot))]);
			}
			parentPort.postMessage({rows} satisfies WorkerReply);
		}
	} else {
		const ladders: LadderCache = new Map();
		const memories: FitMemories = new Map();
		let rows: [number, RowValues][] = [];
		for (const spot of rowSpots(sweep)) {
			if (!isWorkersRow(sweep, spot.index, worker, workers)) continue;
			rows.push([spot.index, rowValues(sweep, spot, ladders, memories, keepCurves)]);
			if (rows.length >= rowsPerReply) {
				parentPort.postMessage({rows} satisfies WorkerReply);
				rows = [];
			}
		}
		if (rows.length) parentPort.postMessage({rows} satisfies WorkerReply);
	}
}
