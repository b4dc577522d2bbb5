/**
 * The built-in demo: an invented patient, not a real person. An adult with thick subcutaneous fat
 * scanned for the liver through a stand-off pad.
 */
import type {PlanDocument} from './plan-schema.js';
import {parsePlanDocument} from './plan-schema.js';

export const demoPlanJson = {
	format: 'evenecho-plan/2',
	name: 'Demo – deep liver through thick fat',
	region: 'upper-abdomen',
	note: 'Invented demo patient "Bed 7, Ward Heron": 5 cm subcutaneous fat over the right lobe.',
	layers: [
		{
			tissue: {label: 'stand-off pad', speedMps: 1540, densityKgM3: 1000, alphaDbPerCmMhz: 0.3, exponent: 1},
			thicknessCm: 1,
		},
		{tissue: 'fat', thicknessCm: 5},
		{tissue: 'muscle', thicknessCm: 1.2},
		{tissue: 'liver', thicknessCm: 20},
	],
	probe: {centerMhz: 3.5, bandwidthFraction: 0.6},
	scattererExponent: 0,
	display: {depthCm: 16, assumedSpeedMps: 1540},
	sliders: {count: 8, minDb: -15, maxDb: 15},
	masterGain: {minDb: 0, maxDb: 60},
	noiseBudgetDb: 65,
} as const;

export function demoPlan(): PlanDocument {
	const r = parsePlanDocument(structuredClone(demoPlanJson));
	if (!r.ok) throw new Error(`demo plan invalid: ${r.errors.join('; ')}`);
	return r.value;
}
