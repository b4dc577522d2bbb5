/** Number fields and the field registry: typing, nudging and refusing, without rendering. */
import fc from 'fast-check';
import {describe, expect, it} from 'vitest';
import {limits, parsePlanDocument} from '../../src/plan/plan-schema.js';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {
	formatNumber,
	isInRange,
	nudge,
	parseEntry,
	rangeMessage,
	type NumberSpec,
} from '../../src/ui/state/number-field.js';
import {fatLayerIndex} from '../../src/plan/fat-layer.js';
import {moveLayer, resizeReference, setFatThickness, standardReference} from '../../src/plan/plan-edits.js';
import {choiceFields, cycleChoice, derivedNoiseBudgetDb, numberFields} from '../../src/ui/state/plan-fields.js';

const mhz: NumberSpec = {
	label: 'Centre frequency',
	unit: 'MHz',
	limit: limits.centerMhz,
	step: 0.5,
	coarse: 2,
	decimals: 2,
};
const count: NumberSpec = {
	label: 'Slider count',
	unit: '',
	limit: limits.sliderCount,
	step: 1,
	coarse: 4,
	decimals: 0,
	integer: true,
};

describe('number fields', () => {
	it('read what was typed, with a comma as a decimal point', () => {
		expect(parseEntry('3.5', mhz)).toEqual({ok: true, value: 3.5});
		expect(parseEntry(' 7,25 ', mhz)).toEqual({ok: true, value: 7.25});
		expect(parseEntry('.5', mhz)).toEqual({ok: true, value: 0.5});
	});

	it('refuse out-of-range, empty, non-numeric and fractional-count entries, naming the range', () => {
		expect(parseEntry('99', mhz)).toEqual({ok: false, message: 'must be a number above 0 and up to 50 MHz'});
		expect(parseEntry('0', mhz)).toEqual({ok: false, message: 'must be a number above 0 and up to 50 MHz'});
		expect(parseEntry('', mhz)).toEqual({
			ok: false,
			message: 'type a value: must be a number above 0 and up to 50 MHz',
		});
		expect(parseEntry('3..5', mhz).ok).toBe(false);
		expect(parseEntry('1e3', mhz).ok).toBe(false);
		expect(parseEntry('2.5', count)).toEqual({ok: false, message: 'must be a whole number from 1 to 16'});
	});

	it('nudge by the fine and coarse step, without binary noise', () => {
		expect(nudge(3.5, mhz, 1)).toEqual({ok: true, value: 4});
		expect(nudge(3.5, mhz, -1, true)).toEqual({ok: true, value: 1.5});
		const tenth: NumberSpec = {...mhz, step: 0.1, decimals: 2};
		expect(nudge(0.2, tenth, 1)).toEqual({ok: true, value: 0.3});
	});

	it('refuse a nudge that leaves the range and keep the value', () => {
		expect(nudge(0.5, mhz, -1)).toEqual({ok: false, message: '0 refused: must be a number above 0 and up to 50 MHz'});
		expect(nudge(16, count, 1).ok).toBe(false);
	});

	it('never nudge out of range (property)', () => {
		fc.assert(
			fc.property(fc.double({min: 0.01, max: 50, noNaN: true}), fc.boolean(), fc.boolean(), (v, up, coarse) => {
				const r = nudge(v, mhz, up ? 1 : -1, coarse);
				return r.ok ? isInRange(r.value, mhz) : r.message.includes(rangeMessage(mhz));
			}),
		);
	});

	it('format with at most the field decimals', () => {
		expect(formatNumber(16, {decimals: 1})).toBe('16');
		expect(formatNumber(0.55, {decimals: 2})).toBe('0.55');
		// More places only when the value has them, so what is shown reads back as what is stored.
		expect(formatNumber(3.456, {decimals: 2})).toBe('3.456');
		expect(formatNumber(0.0014, {decimals: 3})).toBe('0.0014');
		expect(formatNumber(0.1 + 0.2, {decimals: 2})).toBe('0.3');
	});
});

describe('plan fields', () => {
	it('every field the console writes gives a plan the plan format accepts', () => {
		const doc = demoPlan();
		for (const [key, field] of Object.entries(numberFields)) {
			const v = field.get(doc, 0);
			if (v === undefined) continue;
			const next = field.set(doc, 0, v);
			expect(parsePlanDocument(next).ok, key).toBe(true);
		}
	});

	it('check cross-field ranges: low ends below high ends, usual gains inside the bank', () => {
		const doc = demoPlan();
		expect(numberFields.sliderMinDb.check?.(doc, 0, 15)).toBe('must be below the slider high end (15 dB)');
		expect(numberFields.masterMaxDb.check?.(doc, 0, -5)).toBe('must be above the master low end (0 dB)');
		expect(numberFields.sliderMinDb.check?.(doc, 0, -20)).toBeUndefined();
	});

	it('the measured fat edits the first fat layer, or inserts one below skin and pads', () => {
		const doc = demoPlan();
		expect(numberFields.fat.get(doc, 0)).toBe(5);
		const thicker = setFatThickness(doc, 7);
		expect(thicker.layers[1]).toEqual({tissue: 'fat', thicknessCm: 7, thicknessAs: 'displayed'});
		const noFat = {...doc, layers: doc.layers.filter((l) => l.tissue !== 'fat')};
		const added = setFatThickness(noFat, 3);
		expect(fatLayerIndex(added)).toBe(1);
		expect(added.layers).toHaveLength(4);
	});

	it('moving a layer swaps neighbours and leaves the ends alone', () => {
		const doc = demoPlan();
		expect(moveLayer(doc, 0, -1)).toBe(doc);
		expect(moveLayer(doc, 1, 1).layers[2]!.tissue).toBe('fat');
	});

	it('switching the noise budget to a phantom and back keeps the budget the curve used', () => {
		const doc = demoPlan();
		const ctx = {standardReference: () => standardReference(doc, doc.layers)};
		const phantom = choiceFields.noiseSource.set(doc, 'phantom', ctx);
		expect(phantom.phantomCalibration).toBeDefined();
		expect(phantom.noiseBudgetDb).toBeUndefined();
		const back = choiceFields.noiseSource.set(phantom, 'budget', ctx);
		expect(back.noiseBudgetDb).toBeCloseTo(derivedNoiseBudgetDb(phantom), 1);
		expect(cycleChoice(choiceFields.knots, 'band-edges', 1)).toBe('band-centres');
	});

	it('usual gains follow a slider count change', () => {
		const r = resizeReference({masterGainDb: 30, slidersDb: [0, 2, 4, 6]}, 7);
		expect(r.slidersDb).toEqual([0, 1, 2, 3, 4, 5, 6]);
		expect(
			numberFields.sliderCount.set(
				{...demoPlan(), reference: {masterGainDb: 30, slidersDb: [0, 2, 4, 6, 8, 10, 12, 14]}},
				0,
				4,
			).reference?.slidersDb,
		).toHaveLength(4);
	});
});
