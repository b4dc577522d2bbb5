/** Every output that shows the uncertainty band says what it holds, with the one sentence from the engine. */
import {parse} from 'csv-parse/sync';
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {bandScopeNote} from '../../src/engine/uncertainty-band.js';
import {curveCsv, curveJson} from '../../src/report/curve-json.js';
import {curveSummary} from '../../src/report/curve-summary.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';
import {warningsViewLines} from '../../src/ui/plot/warnings-view.js';
import {abdomenPlan} from '../helpers/plans.js';

describe('the band sentence', () => {
	const curve = computeCurve(resolvePlan(abdomenPlan()));

	it('is in the text summary, beside the band column', () => {
		expect(curveSummary(curve)).toContain(bandScopeNote);
	});

	it("is the JSON document's `band` field", () => {
		expect(curveJson(curve).band).toBe(bandScopeNote);
	});

	it("is in the console's warnings-in-full view (w), wrapped to the width", () => {
		const text = warningsViewLines(curve, 96, 60)
			.map((l) => l.text.trim())
			.join(' ');
		expect(text.replace(/^.*?- Band:/, 'Band:')).toContain(bandScopeNote.slice(0, 60));
		expect(warningsViewLines(curve, 96, 60).every((l) => l.text.length <= 96)).toBe(true);
	});
});

describe('the band sentence in the curve CSV (RFC 4180, Shafranovich 2005: no comment lines, same field count in every record)', () => {
	const curve = computeCurve(resolvePlan(abdomenPlan()), {stepCm: 0.5});
	const records = parse(curveCsv(curve), {relax_column_count: false}) as string[][];

	it('is a last column, bandNote, on the first data row only; the columns before it are unchanged', () => {
		const [header, ...rows] = records;
		expect(header).toEqual([
			'displayedDepthCm',
			'trueDepthCm',
			'layer',
			'attenuationDb',
			'interfaceLossDb',
			'compensationDb',
			'lowDb',
			'highDb',
			'echoCenterMhz',
			'blocked',
			'belowNoise',
			'bandNote',
		]);
		expect(rows).toHaveLength(curve.samples.length);
		expect(rows[0]![11]).toBe(bandScopeNote);
		expect(rows.slice(1).every((r) => r.length === 12 && r[11] === '')).toBe(true);
		expect(Number(rows[0]![6])).toBeCloseTo(curve.samples[0]!.lowDb, 3);
	});
});
