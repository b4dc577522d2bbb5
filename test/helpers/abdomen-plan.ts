/** An invented average-adult upper-abdomen stack shared by tests (no real patient, clinic or product). */
import {parsePlanDocument, type PlanDocument} from '../../src/plan/plan-schema.js';

export function abdomenPlanJson(overrides: Record<string, unknown> = {}): Record<string, unknown> {
	return {
		name: 'Test template: upper abdomen, standard adult',
		region: 'upper-abdomen',
		layers: [
			{tissue: 'skin', thicknessCm: 0.2},
			{tissue: 'fat', thicknessCm: 2},
			{tissue: 'muscle', thicknessCm: 1},
			{tissue: 'liver', thicknessCm: 20},
		],
		probe: {centerMhz: 3.5, bandwidthFraction: 0.6},
		display: {depthCm: 16, assumedSpeedMps: 1540},
		noiseBudgetDb: 65,
		...overrides,
	};
}

export function abdomenPlan(overrides: Record<string, unknown> = {}): PlanDocument {
	const r = parsePlanDocument(abdomenPlanJson(overrides));
	if (!r.ok) throw new Error(r.errors.join('; '));
	return r.value;
}
