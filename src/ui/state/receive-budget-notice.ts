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
	const source = after.phantomCalibration ? 'phantom reach was measured' : 'noise budget is';
	if (mode === budget) return `Receive ${receiveModeLabel(mode)}; the ${source} for it too.`;
	return `Receive ${receiveModeLabel(mode)}, but the ${source} for ${receiveModeLabel(budget)}: the reach is not calibrated for this mode. Measure it in ${receiveModeLabel(mode)}, then set "Budget measured in".`;
}
