/**
 * The console's word when receive mode and noise budget part ways: a phantom reach measured in
 * fundamental does not give the harmonic budget, so switching to a harmonic mode says so at once
 * (the curve's own warning, budget-receive-mismatch, stays with the plan). Pure.
 */
import {receiveModeLabel} from '../../engine/receive-notes.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {budgetReceiveOf} from './plan-fields.js';

/** A notice after a change of receive mode or budget mode, or null when they agree or nothing changed. */
export function receiveBudgetNotice(before: PlanDocument, after: PlanDocument): string | null {
	const mode = after.probe.receive ?? 'fundamental';
	const budget = budgetReceiveOf(after);
	if (mode === (before.probe.receive ?? 'fundamental') && budget === budgetReceiveOf(before)) return null;
	const source = after.phantomCalibration ? 'Phantom reach' : 'Noise budget';
	if (mode === budget) return `Receive ${receiveModeLabel(mode)}; the ${source.toLowerCase()} is for it too.`;
	// Short enough for the status line at 100 columns.
	return `${source} is for ${receiveModeLabel(budget)}, not ${receiveModeLabel(mode)}: reach uncalibrated; measure it in this mode.`;
}
