/**
 * What the engine says about each image row: the round-trip loss of the reference echo at the row's
 * displayed depth (attenuation over the probe's spectrum plus interface losses) and whether a barrier
 * (strong reflector or absorber) lies above it, in which case no echo returns and only noise shows.
 */
import {pathModelOf} from '../engine/compensation-curve.js';
import type {EnginePlan} from '../engine/types.js';

/** Image row r shows displayed depth topRowCm + r·cmPerRow (row 0 = skin when topRowCm is 0). */
export interface RowsToDepth {
	readonly topRowCm: number;
	readonly cmPerRow: number;
}

export interface RowEchoes {
	readonly depthCm: Float64Array;
	/** Round-trip loss of the reference echo, dB; NaN where no echo returns (below a barrier). */
	readonly lossDb: Float64Array;
	/** Displayed depth of the barrier, cm, or null. */
	readonly blockedDepthCm: number | null;
}

/** Rows in tissue between skin and the display depth; rows above the skin show no echo either, nor
 * any row with the probe in air (nothing coupled: noise only). */
export function rowEchoes(plan: EnginePlan, height: number, rows: RowsToDepth, probeInAir = false): RowEchoes {
	const model = pathModelOf(plan);
	const blockedDepthCm = model.barrier ? model.barrier.displayedCm : null;
	const depthCm = new Float64Array(height);
	const lossDb = new Float64Array(height);
	for (let r = 0; r < height; r++) {
		const d = rows.topRowCm + r * rows.cmPerRow;
		depthCm[r] = d;
		const blocked = probeInAir || d < 0 || (blockedDepthCm !== null && d > blockedDepthCm);
		lossDb[r] = blocked ? Number.NaN : model.lossAt(d);
	}
	return {depthCm, lossDb, blockedDepthCm};
}
