/**
 * Oblique beams: Snell's law, the fluid–fluid oblique transmission, path lengths d/cos θ and the
 * critical angle, against the shared reference's check cases C51–C53 (derived there from these
 * standard formulas) and the brute-force reference.
 */
import {describe, expect, it} from 'vitest';
import {criticalAngleDeg, lateralShiftMm, obliqueRoundTripLossDb} from '../../src/engine/beam-angle.js';
import {bruteForceAttenuationDb} from '../../src/engine/brute-force-loss.js';
import {computeCurve, pathModelOf} from '../../src/engine/compensation-curve.js';
import type {EnginePlan, Layer} from '../../src/engine/types.js';
import {custom, plan, tissue} from '../helpers/plans.js';

const fat = custom('fat', 1440, 911, 0.6);
const muscle = custom('muscle', 1580, 1050, 0.96);

const angled = (layers: Layer[], angleDeg: number, centerMhz = 3.5): EnginePlan => {
	const p = plan(layers, {centerMhz, depthCm: 20});
	return {...p, probe: {...p.probe, angleDeg}};
};

describe('oblique boundary fat → muscle (1440 m/s, 911 kg/m³ → 1580 m/s, 1050 kg/m³; shared reference §9, case C51)', () => {
	const cases: [number, number][] = [
		[0, 0.12],
		[15, 0.13],
		[30, 0.16],
		[45, 0.26],
		[60, 1.07],
		[64, 2.99],
	];
	for (const [angle, loss] of cases) {
		it(`${angle}°: ${loss} dB round trip`, () =>
			expect(obliqueRoundTripLossDb(fat, muscle, angle)).toBeCloseTo(loss, 2));
	}
	it('critical angle 65.7° (65.9° into liver at 1578 m/s)', () => {
		expect(criticalAngleDeg(fat, muscle)).toBeCloseTo(65.7, 1);
		expect(criticalAngleDeg(fat, custom('liver', 1578, 1060, 0.5))).toBeCloseTo(65.9, 1);
		expect(criticalAngleDeg(muscle, fat)).toBeNull();
	});
	it('normal incidence gives back 1 − R (Maier et al. 2018, Table 11.3 form)', () => {
		const zf = 1440 * 911;
		const zm = 1580 * 1050;
		const r = ((zm - zf) / (zm + zf)) ** 2;
		expect(obliqueRoundTripLossDb(fat, muscle, 0)).toBeCloseTo(-20 * Math.log10(1 - r), 10);
	});
});

describe('path length through an oblique layer (case C52)', () => {
	it('6 cm of fat tilted 15 / 30 / 45° adds 0.21 / 0.93 / 2.49 cm of path and 0.9 / 3.9 / 10.4 dB at 3.5 MHz, 0.6 dB/cm/MHz', () => {
		const layers: Layer[] = [
			{tissue: fat, thicknessCm: 6},
			{tissue: fat, thicknessCm: 30},
		];
		const at6 = (angle: number) => {
			const m = pathModelOf(angled(layers, angle));
			const shown = m.spans[0]!.shownBottomCm;
			return {path: m.spans[0]!.trueBottomCm, db: m.at(shown).attenuationDb};
		};
		const base = at6(0);
		for (const [angle, cm, db] of [
			[15, 0.21, 0.9],
			[30, 0.93, 3.9],
			[45, 2.49, 10.4],
		] as const) {
			const r = at6(angle);
			expect(r.path - base.path).toBeCloseTo(cm, 2);
			expect(r.db - base.db).toBeCloseTo(db, 1);
		}
	});
});

describe('refraction shift (case C53)', () => {
	it('fat → muscle boundary met at 10 / 20 / 30°, target 10 cm beyond along the beam: 1.7 / 3.6 / 5.7 mm', () => {
		for (const [angle, mm] of [
			[10, 1.7],
			[20, 3.6],
			[30, 5.7],
		] as const) {
			// 10 cm along the refracted beam is 10·cos θ2 cm of depth.
			const t2 = Math.asin((Math.sin((angle * Math.PI) / 180) * 1580) / 1440);
			const shift = lateralShiftMm(
				[
					{tissue: fat, thicknessCm: 0},
					{tissue: muscle, thicknessCm: 40},
				],
				angle,
				10 * Math.cos(t2),
			);
			expect(shift!).toBeCloseTo(mm, 1);
		}
	});
});

describe('beam angle in the curve', () => {
	const layers: Layer[] = [
		{tissue: tissue('fat'), thicknessCm: 3},
		{tissue: tissue('muscle'), thicknessCm: 1},
		{tissue: tissue('liver'), thicknessCm: 30},
	];
	it('past the critical angle nothing crosses: a barrier with a warning naming the angle, and the curve is held', () => {
		const r = computeCurve(angled(layers, 70));
		expect(r.blockedDepthCm).not.toBeNull();
		expect(r.warnings.find((w) => w.code === 'strong-reflector')?.message).toMatch(/critical angle \(65\.\d°\)/);
	});
	it('an oblique beam carries the refraction note', () => {
		const r = computeCurve(angled(layers, 30));
		expect(r.warnings.find((w) => w.code === 'refraction-shift')?.message).toMatch(/mm sideways/);
	});
	it('the fast path matches the brute force with the beam tilted (independent Snell and path lengths)', () => {
		for (const angle of [0, 20, 45, 60]) {
			const p = {...angled(layers, angle), probe: {...angled(layers, angle).probe, bandwidthFraction: 0.8}};
			const m = pathModelOf(p);
			const depths = [1, 3.2, 4.5, 9, 16];
			const ref = bruteForceAttenuationDb(p, depths, {points: 4000});
			depths.forEach((d, i) => expect(Math.abs(m.at(d).attenuationDb - ref[i]!)).toBeLessThan(0.001));
		}
	});
});
