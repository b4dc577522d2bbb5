/** The thick-body-wall line (issue text: over about 3 cm of fat; the threshold is common practice, no source). */
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {plan, tissue} from '../helpers/plans.js';

const stack = (fatCm: number) =>
	plan(
		[
			{tissue: tissue('skin'), thicknessCm: 0.2},
			{tissue: tissue('fat'), thicknessCm: fatCm},
			{tissue: tissue('liver'), thicknessCm: 30},
		],
		{centerMhz: 3.5, bandwidthFraction: 0.6},
	);

describe('thick body wall', () => {
	it('over 3 cm of fat under the skin: one note saying what changes and what gain cannot fix', () => {
		const w = computeCurve(stack(6)).warnings.filter((x) => x.code === 'thick-body-wall');
		expect(w).toHaveLength(1);
		expect(w[0]!.message).toMatch(/highest frequency that reaches it falls/);
		expect(w[0]!.message).toMatch(/Gain cannot fix the clutter and aberration/);
	});
	it('3 cm or less: no note', () => {
		expect(computeCurve(stack(3)).warnings.map((x) => x.code)).not.toContain('thick-body-wall');
	});
});
