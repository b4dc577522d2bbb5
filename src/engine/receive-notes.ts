/**
 * The notes and warnings a plan's receive mode brings: the harmonic model it uses, and a noise
 * budget that was measured or stated for another receive mode (a phantom reach measured in
 * fundamental does not give the harmonic budget).
 */
import {receiveModeNote} from './model-notes.js';
import type {CurveWarning, EnginePlan, ReceiveMode} from './types.js';

/** How a receive mode reads in sentences. */
export function receiveModeLabel(mode: ReceiveMode | undefined): string {
	return mode === 'tissue-harmonic'
		? 'tissue harmonic'
		: mode === 'scatterer-harmonic'
			? 'scatterer harmonic'
			: 'fundamental';
}

export function receiveWarnings(plan: EnginePlan): CurveWarning[] {
	const out: CurveWarning[] = [];
	const mode = plan.probe.receive ?? 'fundamental';
	const note = receiveModeNote(mode);
	if (note) out.push({code: 'harmonic-simplified', severity: 'note', message: note});
	if (mode === 'tissue-harmonic' && (plan.probe.spectrumSteepness ?? 2) < 3 && plan.probe.bandwidthFraction > 0) {
		out.push({
			code: 'harmonic-simplified',
			severity: 'note',
			message:
				"With a Gaussian-like spectrum (steepness below 3) the harmonic band's long low-frequency tail " +
				'carries deep echoes and flattens the deep loss (optimistic reach): ' +
				'set probe.spectrumSteepness from the bandwidth (README: which steepness to pick).',
		});
	}
	const budgetMode = plan.noiseBudgetReceive ?? 'fundamental';
	if (budgetMode !== mode) {
		out.push({
			code: 'budget-receive-mismatch',
			severity: 'warning',
			message:
				`The noise budget is for ${receiveModeLabel(budgetMode)} receive, but this plan receives ` +
				`the ${receiveModeLabel(mode)}: the reach shown is not calibrated for it. Measure the ` +
				`phantom reach in ${receiveModeLabel(mode)} mode (or state a budget for it).`,
		});
	}
	return out;
}
