/**
 * The pure side of protocol tables: which plan variants a sweep builds, that each row is exactly
 * the engine's answer for its variant, the standard-habitus deltas, the frequency ladder column,
 * and every class of bad sweep.
 */
import fc from 'fast-check';
import {abdomenPlan} from '../helpers/plans.js';
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {frequencyLadder} from '../../src/engine/frequency-ladder.js';
import {settingsDelta, settingsOf} from '../../src/engine/plan-difference.js';
import {parsePlanDocument, type PlanDocument} from '../../src/plan/plan-schema.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';
import {defaultLadderMhz, maxTableRows, resolveSweep, SweepError, type SweepSpec} from '../../src/table/sweep-spec.js';
import {buildTable} from '../../src/table/sweep-runner.js';
import {harmonicSimplification} from '../../src/engine/model-notes.js';
import {parseNumberList, parseReceive, parseSwap, parseSweepText} from '../../src/table/sweep-options.js';
import {limits} from '../../src/plan/plan-schema.js';

const template = (overrides: Record<string, unknown> = {}): PlanDocument => abdomenPlan(overrides);

function sweepError(fn: () => unknown): SweepError {
	try {
		fn();
	} catch (error) {
		if (error instanceof SweepError) return error;
		throw error;
	}
	throw new Error('expected a SweepError');
}

describe('sweep definition', () => {
	it('an empty sweep gives one row: the plan as it is, exactly as the engine fits it', () => {
		const doc = template();
		const t = buildTable(doc);
		expect(t.rows).toHaveLength(1);
		const r = computeCurve(resolvePlan(doc));
		const row = t.rows[0]!;
		expect(row.layerCm).toBe(2);
		expect(row.centerMhz).toBe(3.5);
		expect(row.receive).toBe('fundamental');
		expect(row.slidersDb).toEqual(r.fit.sliders.map((s) => s.gainDb));
		expect(row.masterGainDb).toBe(r.fit.masterGainDb);
		expect(row.residualDb).toBe(r.fit.residualDb);
		expect(row.penetrationDepthCm).toBe(r.penetrationDepthCm);
		expect(t.reference).toEqual(settingsOf(r.fit));
		expect(t.sweep.ladderMhz).toEqual(defaultLadderMhz);
	});

	it('multiplies the sweeps: frequency, then receive mode, then swaps, with the habitus innermost', () => {
		const t = buildTable(template(), {
			fatCm: [1, 4, 8],
			freqMhz: [2.5, 5],
			receive: ['fundamental', 'tissue-harmonic'],
			swaps: [{layer: 4, choices: [{tissue: 'liver'}, {tissue: 'spleen'}]}],
		});
		expect(t.rows).toHaveLength(3 * 2 * 2 * 2);
		expect(t.sweep.rowCount).toBe(24);
		const key = (r: (typeof t.rows)[number]) => `${r.centerMhz}/${r.receive}/${r.swapLabels[0]}/${r.layerCm}`;
		expect(t.rows.slice(0, 7).map(key)).toEqual([
			'2.5/fundamental/Liver/1',
			'2.5/fundamental/Liver/4',
			'2.5/fundamental/Liver/8',
			'2.5/fundamental/Spleen/1',
			'2.5/fundamental/Spleen/4',
			'2.5/fundamental/Spleen/8',
			'2.5/tissue-harmonic/Liver/1',
		]);
		expect(t.rows.map((r) => r.index)).toEqual(Array.from({length: 24}, (_, i) => i + 1));
	});

	it('each variant changes only the swept layer thickness, the probe frequency, the receive mode and the swapped tissue', () => {
		const doc = template();
		const before = structuredClone(doc);
		const t = buildTable(doc, {
			fatCm: [6],
			freqMhz: [5],
			receive: ['tissue-harmonic'],
			swaps: [{layer: 3, choices: [{tissue: 'muscle-along'}]}],
		});
		expect(doc).toEqual(before);
		const v = t.rows[0]!.doc;
		expect(v.layers.map((l) => [l.tissue, l.thicknessCm])).toEqual([
			['skin', 0.2],
			['fat', 6],
			['muscle-along', 1],
			['liver', 20],
		]);
		expect(v.probe).toEqual({...doc.probe, centerMhz: 5, receive: 'tissue-harmonic'});
		expect({...v, layers: doc.layers, probe: doc.probe}).toEqual(doc);
		// The variant is a valid plan file as it stands.
		expect(parsePlanDocument(JSON.parse(JSON.stringify(v))).ok).toBe(true);
	});

	it('every row is the engine result for its own variant (same sliders, master, residual, penetration, warnings)', () => {
		const t = buildTable(template(), {fatCm: [1, 5], freqMhz: [2, 7.5], receive: ['fundamental', 'tissue-harmonic']});
		for (const row of t.rows) {
			const r = computeCurve(resolvePlan(row.doc), {stepCm: 0.1});
			expect(row.slidersDb).toEqual(r.fit.sliders.map((s) => s.gainDb));
			expect(row.masterGainDb).toBe(r.fit.masterGainDb);
			expect(row.residualDb).toBe(r.fit.residualDb);
			expect(row.penetrationDepthCm).toBe(r.penetrationDepthCm);
			// Tables list warnings only; background notes (speed) are left out.
			expect(row.warnings).toEqual(r.warnings.filter((w) => w.severity === 'warning'));
		}
	});

	it('the subcutaneous layer is the first "fat" layer; --layer picks another; a plan without fat needs --layer', () => {
		expect(resolveSweep(template(), {fatCm: [3]}).layerIndex).toBe(1);
		const t = buildTable(template(), {fatCm: [0.5, 2.5], layer: 3});
		expect(t.rows.map((r) => r.doc.layers[2]!.thicknessCm)).toEqual([0.5, 2.5]);
		expect(t.rows.map((r) => r.doc.layers[1]!.thicknessCm)).toEqual([2, 2]);
		const noFat = template({
			layers: [
				{tissue: 'skin', thicknessCm: 0.2},
				{tissue: 'muscle', thicknessCm: 2},
				{tissue: 'liver', thicknessCm: 20},
			],
		});
		expect(sweepError(() => resolveSweep(noFat, {fatCm: [1]})).message).toMatch(
			/--fat: the plan has no layer of tissue "fat".*--layer N \(from 1 to 3\)/,
		);
		expect(resolveSweep(noFat).layerIndex).toBeNull();
		expect(buildTable(noFat).rows[0]!.layerCm).toBeNull();
	});

	it('refuses to sweep the deepest layer (it extends as far as needed) and layer numbers outside the plan', () => {
		expect(sweepError(() => resolveSweep(template(), {fatCm: [1], layer: 4})).message).toMatch(
			/deepest layer.*from 1 to 3/,
		);
		expect(sweepError(() => resolveSweep(template(), {fatCm: [1], layer: 5})).message).toMatch(
			/--layer: must be a whole number from 1 to 4/,
		);
		expect(sweepError(() => resolveSweep(template(), {fatCm: [1], layer: 0})).option).toBe('layer');
		expect(sweepError(() => resolveSweep(template(), {layer: 4})).message).toMatch(
			/^--layer: layer 4 is the deepest layer/,
		);
		// A plan whose only fat layer is the deepest shows no habitus column rather than a meaningless one.
		const fatOnly = template({
			layers: [
				{tissue: 'skin', thicknessCm: 0.2},
				{tissue: 'fat', thicknessCm: 10},
			],
		});
		expect(resolveSweep(fatOnly).layerIndex).toBeNull();
		expect(sweepError(() => resolveSweep(fatOnly, {fatCm: [1]})).message).toMatch(
			/^--fat: layer 2 is the deepest layer/,
		);
	});

	it('swaps a tissue from another plan (a custom record) and records where it came from', () => {
		const cyst = {
			label: 'Cyst, "simple" <test>',
			speedMps: 1550,
			densityKgM3: 1010,
			alphaDbPerCmMhz: 0.01,
			exponent: 2,
			source: 'invented test tissue',
		};
		const t = buildTable(template(), {
			swaps: [{layer: 4, choices: [{tissue: 'liver'}, {tissue: cyst, from: 'layer 2 of preset "pelvis-test"'}]}],
		});
		expect(t.rows.map((r) => r.swapLabels[0])).toEqual(['Liver', cyst.label]);
		expect(t.rows[1]!.doc.layers[3]!.tissue).toEqual(cyst);
		expect(t.tissues.at(-1)).toMatchObject({
			where: 'layer 4 (swap)',
			from: 'layer 2 of preset "pelvis-test"',
			tissue: {label: cyst.label, source: 'invented test tissue'},
		});
	});
});

describe('deltas from the standard habitus', () => {
	it('the standard habitus is the input plan fitted as it is; its own row has zero deltas', () => {
		const t = buildTable(template(), {fatCm: [1, 2, 6], delta: true});
		const std = t.rows.find((r) => r.layerCm === 2)!;
		expect(std.delta!.masterDeltaDb).toBe(0);
		expect(std.delta!.sliderDeltasDb.every((d) => d === 0)).toBe(true);
		for (const r of t.rows) {
			expect(r.delta).toEqual(settingsDelta({masterGainDb: r.masterGainDb, slidersDb: r.slidersDb}, t.reference));
		}
	});

	it('rows at other frequencies are compared with the plan at its own frequency (what the operator starts from)', () => {
		const t = buildTable(template(), {freqMhz: [3.5, 5], delta: true});
		expect(t.reference).toEqual(settingsOf(computeCurve(resolvePlan(template())).fit));
		expect(t.rows[0]!.delta!.sliderDeltasDb.every((d) => d === 0)).toBe(true);
		expect(t.rows[1]!.delta!.sliderDeltasDb.some((d) => d !== 0)).toBe(true);
	});

	it('no delta field without --delta', () => {
		expect(buildTable(template()).rows[0]!.delta).toBeUndefined();
	});
});

describe('highest reaching frequency', () => {
	it('is the frequency ladder over the --freq list at the plan target depth, with the margin', () => {
		const doc = template({targetDepthCm: 12});
		const t = buildTable(doc, {fatCm: [1, 8], freqMhz: [2, 3.5, 5, 7.5], marginDb: 6});
		for (const r of t.rows) {
			expect(r.highestReachingMhz).toBe(frequencyLadder(r.plan, [2, 3.5, 5, 7.5], 12, 6).highestReachingMhz);
		}
		expect(t.sweep.targetDepthCm).toBe(12);
		expect(t.sweep.ladderFrom).toBe('freq');
	});

	it('uses 1 to 15 MHz in 0.5 MHz steps without --freq, and --ladder when given', () => {
		expect(defaultLadderMhz).toHaveLength(29);
		expect(defaultLadderMhz[0]).toBe(1);
		expect(defaultLadderMhz.at(-1)).toBe(15);
		const t = buildTable(template(), {ladderMhz: [9, 2, 4]});
		expect(t.sweep.ladderMhz).toEqual([2, 4, 9]);
		expect(t.rows[0]!.highestReachingMhz).toBe(frequencyLadder(t.rows[0]!.plan, [2, 4, 9], 16, 0).highestReachingMhz);
	});

	it('a larger margin never raises it (a margin only tightens the budget; common practice, no source)', () => {
		const a = buildTable(template(), {fatCm: [1, 4, 8], marginDb: 0});
		const b = buildTable(template(), {fatCm: [1, 4, 8], marginDb: 10});
		a.rows.forEach((r, i) => expect(b.rows[i]!.highestReachingMhz ?? 0).toBeLessThanOrEqual(r.highestReachingMhz ?? 0));
	});
});

describe('physics seen through the table', () => {
	it(
		'a higher centre frequency meets the noise floor no deeper (attenuation rises with ' +
			'frequency, α = α0·f^n: Szabo 2004, ch. 4, from memory)',
		() => {
			const t = buildTable(template({display: {depthCm: 30, assumedSpeedMps: 1540}}), {freqMhz: [2, 3.5, 5, 7.5]});
			const depth = (r: (typeof t.rows)[number]) => r.penetrationDepthCm ?? Infinity;
			for (let i = 1; i < t.rows.length; i++) expect(depth(t.rows[i]!)).toBeLessThanOrEqual(depth(t.rows[i - 1]!));
			expect(t.rows.at(-1)!.penetrationDepthCm).not.toBeNull();
		},
	);

	it(
		'tissue-harmonic receive at the same f0 meets the noise floor sooner: the way down costs ' +
			'2·α(f0), the way back α(2·f0) (Cobb 1983 plane-wave build-up, formula via a textbook ' +
			'excerpt)',
		() => {
			const doc = template({display: {depthCm: 30, assumedSpeedMps: 1540}});
			// A steep spectrum (the README's pick for 60 %): a Gaussian's low tail would flatten the deep harmonic loss.
			const t = buildTable(
				{...doc, probe: {...doc.probe, spectrumSteepness: 4}},
				{receive: ['fundamental', 'tissue-harmonic']},
			);
			const [fund, harm] = t.rows;
			expect(harm!.penetrationDepthCm).not.toBeNull();
			expect(harm!.penetrationDepthCm!).toBeLessThan(fund!.penetrationDepthCm ?? Infinity);
			expect(t.notes).toContain(harmonicSimplification);
			expect(buildTable(template()).notes).not.toContain(harmonicSimplification);
		},
	);
});

describe('bad sweeps', () => {
	const cases: [string, SweepSpec, string, RegExp][] = [
		['an empty --fat list', {fatCm: []}, 'fat', /--fat: no values given.*above 0 and up to 50 cm/],
		['a negative thickness', {fatCm: [1, -2]}, 'fat', /--fat: -2 is negative.*above 0 and up to 50 cm/],
		['a zero thickness', {fatCm: [0]}, 'fat', /--fat: 0 is out of range.*above 0 and up to 50 cm/],
		['a thickness beyond the plan format', {fatCm: [51]}, 'fat', /--fat: 51 is out of range/],
		['a thickness twice', {fatCm: [2, 4, 2]}, 'fat', /--fat: 2 is listed twice/],
		['not a number', {fatCm: [Number.NaN]}, 'fat', /--fat: every value must be a number/],
		['a zero frequency', {freqMhz: [0]}, 'freq', /--freq: 0 is out of range.*above 0 and up to 50 MHz/],
		['a frequency beyond range', {freqMhz: [3, 80]}, 'freq', /--freq: 80 is out of range/],
		['a negative margin', {marginDb: -1}, 'margin', /--margin: must be a number from 0 to 100 dB/],
		[
			'an unknown swap tissue',
			{swaps: [{layer: 4, choices: [{tissue: 'unobtainium'}]}]},
			'swap',
			/--swap: unknown tissue "unobtainium" for layer 4; known tissues: water/,
		],
		[
			'a swap outside the plan',
			{swaps: [{layer: 7, choices: [{tissue: 'liver'}]}]},
			'swap',
			/--swap: the layer number must be a whole number from 1 to 4/,
		],
		[
			'the same layer swapped twice',
			{
				swaps: [
					{layer: 4, choices: [{tissue: 'liver'}]},
					{layer: 4, choices: [{tissue: 'spleen'}]},
				],
			},
			'swap',
			/layer 4 is swapped twice/,
		],
		[
			'the same tissue twice in a swap',
			{swaps: [{layer: 4, choices: [{tissue: 'liver'}, {tissue: 'liver'}]}]},
			'swap',
			/same tissue twice/,
		],
		['a bad sample step', {stepCm: 0}, 'step', /--step: must be a number from 0.01 to 5 cm/],
	];
	for (const [what, spec, option, message] of cases) {
		it(`${what} → SweepError naming --${option}`, () => {
			const e = sweepError(() => resolveSweep(template(), spec));
			expect(e.option).toBe(option);
			expect(e.message).toMatch(message);
		});
	}

	it(`more than ${maxTableRows.toLocaleString('en-US')} combinations are refused before anything runs, with the count and the cap`, () => {
		const fat = Array.from({length: 201}, (_, i) => 0.1 * (i + 1));
		const freq = Array.from({length: 100}, (_, i) => 0.5 * (i + 1));
		const e = sweepError(() => buildTable(template(), {fatCm: fat, freqMhz: freq}));
		expect(e.option).toBe('sweep');
		expect(e.message).toContain('20,100 combinations (201 --fat × 100 --freq × 1 --receive)');
		expect(e.message).toContain('at most 20,000 rows');
		// Exactly at the cap is allowed (checked without running it).
		expect(resolveSweep(template(), {fatCm: fat.slice(0, 200), freqMhz: freq}).rowCount).toBe(20_000);
	});
});

describe('parsing typed options', () => {
	const thickness = (text: string) => parseNumberList('fat', text, limits.thicknessCm, 'cm');

	it('reads comma lists and from:to:step ranges', () => {
		expect(thickness('1,2, 4 ,6,8')).toEqual([1, 2, 4, 6, 8]);
		expect(thickness('.5,2.25')).toEqual([0.5, 2.25]);
		expect(thickness('1:3:0.5')).toEqual([1, 1.5, 2, 2.5, 3]);
		expect(thickness('0.1:0.3:0.1')).toEqual([0.1, 0.2, 0.3]);
	});

	it('refuses empty lists, empty entries, words, hex, exponents, bad ranges, negatives and duplicates, naming the option and range', () => {
		const bad: [string, RegExp][] = [
			['', /--fat: no values given; expected a comma-separated list of numbers above 0 and up to 50 cm/],
			['  ', /no values given/],
			['1,,2', /--fat: empty entry in "1,,2"/],
			['1,two', /--fat: "two" is not a number/],
			['0x10', /"0x10" is not a number/],
			['1e1', /"1e1" is not a number/],
			['Infinity', /"Infinity" is not a number/],
			['-1', /-1 is negative/],
			['3:1:1', /needs a step above 0 and to ≥ from/],
			['1:2', /not a from:to:step range/],
			['1,2,1', /1 is listed twice/],
			['0.001:50:0.001', /makes 50000 values; at most 20000/],
		];
		for (const [text, message] of bad) {
			expect(sweepError(() => thickness(text)).message, text).toMatch(message);
		}
	});

	it('reads --receive and --swap forms', () => {
		expect(parseReceive('both')).toEqual(['fundamental', 'tissue-harmonic']);
		expect(parseReceive('harmonic')).toEqual(['tissue-harmonic']);
		expect(parseReceive('scatterer-harmonic')).toEqual(['scatterer-harmonic']);
		expect(sweepError(() => parseReceive('on')).message).toBe(
			'--receive: must be fundamental, tissue-harmonic (or harmonic), scatterer-harmonic or both (got "on")',
		);
		expect(parseSwap('4=liver, spleen')).toEqual({layer: 4, choices: [{tissue: 'liver'}, {tissue: 'spleen'}]});
		const lookup = (preset: string, m: number) =>
			preset === 'user:my-pelvis' ? {tissue: 'urine' as const, from: `layer ${m} of preset "${preset}"`} : undefined;
		expect(parseSwap('3=user:my-pelvis:2', lookup)).toEqual({
			layer: 3,
			choices: [{tissue: 'urine', from: 'layer 2 of preset "user:my-pelvis"'}],
		});
		expect(sweepError(() => parseSwap('3=nowhere:2', lookup)).message).toMatch(/no preset or template "nowhere"/);
		expect(sweepError(() => parseSwap('liver')).message).toMatch(/has no "="/);
		expect(sweepError(() => parseSwap('x=liver')).message).toMatch(/"x" is not a layer number/);
		expect(sweepError(() => parseSwap('3=')).message).toMatch(/empty tissue/);
		expect(sweepError(() => parseSwap('3=pelvis:0', lookup)).message).toMatch(/PRESET:M with M a layer number from 1/);
	});

	it('parseSweepText leaves what was not typed to the defaults', () => {
		expect(parseSweepText({})).toEqual({});
		expect(
			parseSweepText({
				fat: '1,2',
				freq: '3',
				receive: 'both',
				delta: true,
				margin: '3',
				step: '0.2',
				swap: ['4=spleen'],
				layer: '2',
				ladder: '2:4:1',
			}),
		).toEqual({
			fatCm: [1, 2],
			freqMhz: [3],
			receive: ['fundamental', 'tissue-harmonic'],
			delta: true,
			marginDb: 3,
			stepCm: 0.2,
			swaps: [{layer: 4, choices: [{tissue: 'spleen'}]}],
			layer: 2,
			ladderMhz: [2, 3, 4],
		});
	});

	it('any list of distinct in-range thicknesses gives one row per value, in the given order (property)', () => {
		const doc = template({display: {depthCm: 8, assumedSpeedMps: 1540}});
		fc.assert(
			fc.property(fc.uniqueArray(fc.integer({min: 1, max: 500}), {minLength: 1, maxLength: 4}), (tenths) => {
				const fat = tenths.map((t) => t / 10);
				const t = buildTable(doc, {fatCm: fat, stepCm: 0.5});
				expect(t.rows.map((r) => r.layerCm)).toEqual(fat);
				expect(t.rows.map((r) => r.doc.layers[1]!.thicknessCm)).toEqual(fat);
			}),
			{numRuns: 15, seed: 5},
		);
	});
});
