/**
 * The master/slider split gives neighbouring rows of a fat sweep neighbouring master gains.
 * The requirement itself is common practice, no source: a protocol table whose master gain zig-zags
 * between neighbouring habitus rows cannot be followed at the scanner.
 */
import {describe, expect, it} from 'vitest';
import {abdomenPlanJson} from '../fixtures/plans.js';
import {parsePlanDocument, type PlanDocument} from '../../src/plan/plan-schema.js';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';

function masterAt(fatCm: number, centerMhz: number): number {
	const parsed = parsePlanDocument(abdomenPlanJson());
	if (!parsed.ok) throw new Error(parsed.errors.join('; '));
	const doc: PlanDocument = parsed.value;
	const layers = doc.layers.map((l) => (l.tissue === 'fat' ? {...l, thicknessCm: fatCm} : l));
	return computeCurve(resolvePlan({...doc, layers, probe: {...doc.probe, centerMhz}})).fit.masterGainDb;
}

describe('master gain across a fat sweep', () => {
	for (const mhz of [3.5, 5]) {
		it(`moves by at most 1 dB between fat thicknesses 0.5 cm apart and never reverses sharply (${mhz} MHz)`, () => {
			const masters = Array.from({length: 15}, (_, i) => masterAt(1 + i * 0.5, mhz));
			for (let i = 1; i < masters.length; i++) expect(Math.abs(masters[i]! - masters[i - 1]!)).toBeLessThanOrEqual(1);
			// No zig-zag: second differences stay small next to the steps themselves.
			for (let i = 2; i < masters.length; i++) {
				const second = masters[i]! - 2 * masters[i - 1]! + masters[i - 2]!;
				expect(Math.abs(second)).toBeLessThanOrEqual(0.6);
			}
		});
	}
});
