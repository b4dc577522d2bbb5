/**
 * Frequency ladder: how deep each probe frequency reaches above the noise floor, and the highest
 * frequency that still reaches a target depth with a margin. Higher frequencies resolve better but
 * lose more per cm, so the useful choice is the highest one that still gets there.
 *
 * The noise budget is taken as the same number of dB at every frequency (a simplification: real
 * front ends vary across their band; stated in outputs).
 */
import {pathModelOf} from './compensation-curve.js';
import type {PathModel} from './path-model.js';
import type {EnginePlan} from './types.js';

export interface LadderRung {
	readonly centerMhz: number;
	/** Displayed depth where the loss reaches the budget, cm; null if beyond `searchCm`. */
	readonly penetrationDepthCm: number | null;
	/** Does it reach the target depth with the margin? */
	readonly reachesTarget: boolean;
}

export interface FrequencyLadder {
	readonly rungs: readonly LadderRung[];
	/** Highest frequency that reaches the target; null if none does. */
	readonly highestReachingMhz: number | null;
	readonly targetDepthCm: number;
	readonly marginDb: number;
}

/** Deepest depth the ladder looks at, cm (the plan format's display limit). */
export const ladderSearchCm = 40;

/** A plan with another centre frequency (same fractional bandwidth). */
export function atFrequency(plan: EnginePlan, centerMhz: number): EnginePlan {
	return {...plan, probe: {...plan.probe, centerMhz}};
}

/** How far from the noise-floor depth (cm) the target must lie for that depth to settle the question:
 * 100× the search's 1e-5 cm. */
const settledCm = 1e-3;

/**
 * Is the loss at the target within the budget? Without a margin the budget is the noise floor's own,
 * and where the loss grows with depth (every receive mode but the tissue harmonic) the target is within
 * it exactly when it lies above the noise-floor depth just found; only a target within 1e-3 cm of that
 * depth (or a margin) needs the loss itself.
 */
function withinBudget(
	model: PathModel,
	targetCm: number,
	penetrationCm: number | null,
	budgetDb: number,
	marginDb: number,
): boolean {
	if (marginDb === 0 && model.receive !== 'tissue-harmonic') {
		if (penetrationCm === null && targetCm <= ladderSearchCm) return true;
		if (penetrationCm !== null && targetCm < penetrationCm - settledCm) return true;
		if (penetrationCm !== null && targetCm > penetrationCm + settledCm) return false;
	}
	return model.lossAt(targetCm) <= budgetDb;
}

export function frequencyLadder(
	plan: EnginePlan,
	frequenciesMhz: readonly number[],
	targetDepthCm: number,
	marginDb = 0,
): FrequencyLadder {
	const budget = plan.noiseBudgetDb - marginDb;
	// The depth falls smoothly from rung to rung: each search starts where the last two rungs point
	// (a guess only: depthForLoss brackets it and checks the bracket).
	const found: {mhz: number; cm: number}[] = [];
	const guessAt = (f: number): number | undefined => {
		const b = found[found.length - 1];
		const a = found[found.length - 2];
		if (!b) return undefined;
		if (!a || a.mhz === b.mhz) return b.cm;
		return b.cm + ((b.cm - a.cm) * (f - b.mhz)) / (b.mhz - a.mhz);
	};
	const rungs = [...frequenciesMhz]
		.sort((a, b) => a - b)
		.map((f) => {
			const model = pathModelOf(atFrequency(plan, f));
			const guessCm = guessAt(f);
			const penetrationDepthCm = model.depthForLoss(
				plan.noiseBudgetDb,
				ladderSearchCm,
				guessCm === undefined ? undefined : {guessCm},
			);
			if (penetrationDepthCm !== null) found.push({mhz: f, cm: penetrationDepthCm});
			const reachesTarget =
				withinBudget(model, targetDepthCm, penetrationDepthCm, budget, marginDb) &&
				!(model.barrier && model.barrier.displayedCm < targetDepthCm);
			return {centerMhz: f, penetrationDepthCm, reachesTarget};
		});
	const reaching = rungs.filter((r) => r.reachesTarget);
	return {
		rungs,
		highestReachingMhz: reaching.length ? reaching[reaching.length - 1]!.centerMhz : null,
		targetDepthCm,
		marginDb,
	};
}
