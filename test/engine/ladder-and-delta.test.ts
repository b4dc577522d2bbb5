/** The frequency ladder and plan-against-plan deltas, in the engine and through the CLI. */
import {mkdtempSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {frequencyLadder} from '../../src/engine/frequency-ladder.js';
import {settingsDelta, settingsOf} from '../../src/engine/plan-difference.js';
import {demoPlanJson} from '../../src/plan/demo-plan.js';
import {custom, plan, tissue} from '../helpers/plans.js';
import {runCli} from '../helpers/run-cli.js';

describe('frequency ladder', () => {
	it(
		'100 dB of dynamic range at 3 MHz in 1 dB/cm/MHz tissue reaches 16.7 cm, and 33.3 cm at ' +
			'0.5 dB/cm/MHz (round trip: depth = DR/(2·α·f), common practice, no source; derived)',
		() => {
			const one = plan([{tissue: custom('one', 1540, 1000, 1), thicknessCm: 50}], {noiseBudgetDb: 100, depthCm: 40});
			const half = plan([{tissue: custom('half', 1540, 1000, 0.5), thicknessCm: 50}], {
				noiseBudgetDb: 100,
				depthCm: 40,
			});
			expect(frequencyLadder(one, [3], 10).rungs[0]!.penetrationDepthCm).toBeCloseTo(16.67, 2);
			expect(frequencyLadder(half, [3], 10).rungs[0]!.penetrationDepthCm).toBeCloseTo(33.33, 2);
		},
	);

	it('penetration falls as frequency rises, and the highest reaching frequency honours the margin', () => {
		const p = plan(
			[
				{tissue: tissue('fat'), thicknessCm: 4},
				{tissue: tissue('liver'), thicknessCm: 30},
			],
			{noiseBudgetDb: 60, bandwidthFraction: 0},
		);
		const ladder = frequencyLadder(p, [2, 3, 4, 5, 6, 7], 10, 6);
		const depths = ladder.rungs.map((r) => r.penetrationDepthCm ?? 99);
		for (let i = 1; i < depths.length; i++) expect(depths[i]!).toBeLessThan(depths[i - 1]!);
		const best = ladder.highestReachingMhz!;
		const model = computeCurve({...p, probe: {...p.probe, centerMhz: best}, display: {...p.display, depthCm: 10}});
		expect(model.samples.at(-1)!.compensationDb).toBeLessThanOrEqual(60 - 6);
		const next = ladder.rungs.find((r) => r.centerMhz > best);
		if (next) expect(next.reachesTarget).toBe(false);
	});

	it('the CLI prints the ladder and refuses a bad list with exit 2', () => {
		const dir = mkdtempSync(join(tmpdir(), 'evenecho-ladder-'));
		const path = join(dir, 'demo.json');
		writeFileSync(path, JSON.stringify(demoPlanJson));
		const ok = runCli([
			'ladder',
			path,
			'--freqs',
			'2,3.5,5,7.5',
			'--target',
			'14',
			'--margin',
			'6',
			'--format',
			'json',
		]);
		expect(ok.status).toBe(0);
		const j = JSON.parse(ok.stdout);
		expect(j.rungs).toHaveLength(4);
		expect(j.highestReachingMhz).toBe(5);
		for (const [args, message] of [
			[['--freqs', ''], /--freqs: no values given/],
			[['--freqs', '2,-1'], /--freqs: .*above 0 and up to 50 MHz/],
			[['--freqs', '2,abc'], /--freqs: "abc" is not a number/],
			[['--margin', '-3'], /--margin: must be a number from 0 to 100 dB/],
			[['--target', '99'], /--target: must be a number above 0 and up to \d+ cm \(the plan's display depth\)/],
		] as const) {
			const r = runCli(['ladder', path, ...args]);
			expect(r.status).toBe(2);
			expect(r.stdout).toBe('');
			expect(r.stderr).toMatch(message);
		}
	});
});

describe('a patient against the standard habitus', () => {
	it('deltas are patient minus reference, per slider and for the master gain', () => {
		const standard = plan(
			[
				{tissue: tissue('fat'), thicknessCm: 1.5},
				{tissue: tissue('liver'), thicknessCm: 30},
			],
			{bandwidthFraction: 0.6},
		);
		const thick = {
			...standard,
			layers: [
				{tissue: tissue('fat'), thicknessCm: 6},
				{tissue: tissue('liver'), thicknessCm: 30},
			],
		};
		const a = settingsOf(computeCurve(thick).fit);
		const b = settingsOf(computeCurve(standard).fit);
		const d = settingsDelta(a, b);
		d.sliderDeltasDb.forEach((x, k) => expect(x).toBeCloseTo(a.slidersDb[k]! - b.slidersDb[k]!, 12));
		expect(d.masterDeltaDb).toBeCloseTo(a.masterGainDb - b.masterGainDb, 12);
		// More fat (0.6 dB/cm/MHz, more than liver's ~0.5·f^0.1) needs more gain at depth overall.
		expect(d.totalDeltasDb.at(-1)!).toBeGreaterThan(0);
	});

	it('curve --against prints the differences; mismatched banks are refused', () => {
		const dir = mkdtempSync(join(tmpdir(), 'evenecho-against-'));
		const patient = join(dir, 'patient.json');
		const standard = join(dir, 'standard.json');
		const other = join(dir, 'other.json');
		writeFileSync(patient, JSON.stringify(demoPlanJson));
		writeFileSync(
			standard,
			JSON.stringify({
				...demoPlanJson,
				name: 'standard habitus',
				layers: [
					{tissue: 'fat', thicknessCm: 1.5},
					{tissue: 'liver', thicknessCm: 20},
				],
			}),
		);
		writeFileSync(other, JSON.stringify({...demoPlanJson, sliders: {count: 6}}));
		const r = runCli(['curve', patient, '--against', standard]);
		expect(r.status).toBe(0);
		expect(r.stdout).toContain('Against standard habitus: master');
		const j = JSON.parse(runCli(['curve', patient, '--against', standard, '--format', 'json']).stdout);
		expect(j.against.sliders).toHaveLength(8);
		const bad = runCli(['curve', patient, '--against', other]);
		expect(bad.status).toBe(2);
		expect(bad.stderr).toMatch(/--against: .* must have the same display depth, slider count/);
	});
});
