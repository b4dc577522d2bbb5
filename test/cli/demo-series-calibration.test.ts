/**
 * The demo phantom series written by `evenecho simulate`, read back by the project's own image reader through
 * `evenecho scanner calibrate`, gives back the truth the simulator used (issue tolerances: grey map and depth
 * response within 1.5 dB, slider travel within 1.5 dB, penetration within 1 cm). The images are simulated test
 * images whose truth the test knows; penetration has the meaning of IEC 61391-2 as the shared method states it
 * (echo power equal to noise power).
 */
import {mkdtempSync, readFileSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {abdomenPlanJson} from '../fixtures/plans.js';
import {runCli} from '../helpers/run-cli.js';

interface Point {
	readonly x: number;
	readonly y: number;
}

function at(points: readonly Point[], x: number): number | null {
	for (let i = 1; i < points.length; i++) {
		const a = points[i - 1]!;
		const b = points[i]!;
		if (x >= a.x && x <= b.x) return a.y + ((x - a.x) / (b.x - a.x)) * (b.y - a.y);
	}
	return null;
}

/** Largest difference once the arbitrary zero (the mean offset) is taken out. */
function worstAfterOffset(measured: readonly Point[], truth: readonly Point[]): number {
	const pairs = measured.flatMap((p) => {
		const t = at(truth, p.x);
		return t === null ? [] : [[p.y, t] as const];
	});
	expect(pairs.length).toBeGreaterThan(5);
	const offset = pairs.reduce((s, [m, t]) => s + m - t, 0) / pairs.length;
	return Math.max(...pairs.map(([m, t]) => Math.abs(m - t - offset)));
}

describe('demo phantom series → scanner calibrate', () => {
	for (const [format, seed] of [
		['dicom', 3],
		['png', 8],
	] as const) {
		it(`${format}, seed ${seed}: the profile recovers the simulator's truth`, () => {
			const dir = mkdtempSync(join(tmpdir(), 'evenecho-demo-series-'));
			const planPath = join(dir, 'plan.json');
			writeFileSync(planPath, JSON.stringify(abdomenPlanJson()));
			const out = join(dir, 'series');
			const made = runCli(['simulate', planPath, '--out', out, '--format', format, '--seed', String(seed)]);
			expect(made.status, made.stderr).toBe(0);
			const cal = runCli([
				'scanner',
				'calibrate',
				join(out, 'session.json'),
				'--name',
				`Demo ${format}`,
				'--format',
				'json',
			]);
			expect(cal.status, cal.stderr).toBe(0);
			const profile = JSON.parse(cal.stdout);
			const truth = JSON.parse(readFileSync(join(out, 'truth.json'), 'utf8'));

			const grey = (list: {grey: number; levelDb: number}[]) => list.map((g) => ({x: g.grey, y: g.levelDb}));
			const greyMeasured = grey(profile.greyMap).filter((p) => p.x >= 30 && p.x <= 220);
			expect(worstAfterOffset(greyMeasured, grey(truth.scanner.greyMap))).toBeLessThan(1.5);

			const depth = (list: {depthCm: number; gainDb: number}[]) => list.map((d) => ({x: d.depthCm, y: d.gainDb}));
			expect(worstAfterOffset(depth(profile.depthResponse), depth(truth.scanner.depthResponse))).toBeLessThan(1.5);

			expect(Math.abs(profile.sliderTravelDb - truth.scanner.sliderTravelDb)).toBeLessThan(1.5);
			expect(Math.abs(profile.penetrationCm - truth.penetrationCm)).toBeLessThan(1);
		});
	}
});
