/**
 * Outside checks of the speckle statistics the band levels and their uncertainty rest on.
 */
import {describe, expect, it} from 'vitest';
import {bandRows, measureBands} from '../../src/analysis/band-levels.js';
import {logLevelMap} from '../../src/analysis/level-map.js';
import {maskNonSpeckle} from '../../src/analysis/speckle-mask.js';
import {
	cellsForHalfWidth,
	logMeanBiasDb,
	logSpeckleSdDb,
	rayleighAmplitudeSnr,
	t95,
} from '../../src/speckle/speckle-statistics.js';
import {mulberry32} from '../../src/simulate/seeded-random.js';
import {speckleFrame} from '../helpers/speckle-frame.js';
import {scenarioPlan} from '../helpers/refine-scenario.js';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {settingsOfFit} from '../../src/analysis/applied-gain.js';

describe('speckle constants', () => {
	it('Rayleigh amplitude mean/SD is 1.913 (Wagner, Smith, Sandrik & Lopez 1983, from memory)', () => {
		expect(rayleighAmplitudeSnr).toBeCloseTo(1.913, 3);
	});
	it('SD of log-compressed speckle is 5.57 dB at any level (Kaplan & Ma 1994, from memory)', () => {
		expect(logSpeckleSdDb).toBeCloseTo(5.57, 2);
	});
	it('mean of dB less dB of the mean intensity is −10γ/ln10 = −2.507 dB (exponential intensity, Burckhardt 1978)', () => {
		expect(logMeanBiasDb).toBeCloseTo(-2.507, 3);
	});
	it('cells for a band mean within ±0.25 / ±0.5 / ±1 dB at 95 %: 1907 / 477 / 119 (shared method notes, C33)', () => {
		expect(Math.round(cellsForHalfWidth(0.25))).toBe(1907);
		expect(Math.round(cellsForHalfWidth(0.5))).toBe(477);
		expect(Math.round(cellsForHalfWidth(1))).toBe(119);
	});
	it('Student t 97.5 % quantiles match the printed tables (2.571 at 5, 2.262 at 9, 2.228 at 10, 2.086 at 20; from memory)', () => {
		expect(t95(5)).toBeCloseTo(2.571, 1);
		expect(t95(9)).toBeCloseTo(2.262, 2);
		expect(t95(10)).toBeCloseTo(2.228, 2);
		expect(t95(20)).toBeCloseTo(2.086, 2);
	});
});

describe('the same constants measured on simulated speckle', () => {
	it('a simulated Rayleigh field shows amplitude SNR 1.91 and dB SD 5.57 (Wagner 1983; Kaplan & Ma 1994)', () => {
		const rnd = mulberry32(42);
		const n = 200_000;
		let a1 = 0;
		let a2 = 0;
		let d1 = 0;
		let d2 = 0;
		for (let i = 0; i < n; i++) {
			const u = Math.max(1e-12, rnd());
			const amp = Math.sqrt(-Math.log(u)); // Rayleigh: intensity exponential
			const db = 20 * Math.log10(amp);
			a1 += amp;
			a2 += amp * amp;
			d1 += db;
			d2 += db * db;
		}
		const am = a1 / n;
		const dm = d1 / n;
		// Tolerances: about 4 standard errors at this sample size.
		expect(am / Math.sqrt(a2 / n - am * am)).toBeCloseTo(1.913, 1);
		expect(Math.sqrt(d2 / n - dm * dm)).toBeGreaterThan(5.57 - 0.04);
		expect(Math.sqrt(d2 / n - dm * dm)).toBeLessThan(5.57 + 0.04);
		expect(dm - 10 * Math.log10(a2 / n)).toBeCloseTo(-2.507, 1);
	});

	it('band-mean SD predicted from the counted cells matches the spread over 30 independent frames (shared notes C34: within ~15 %)', () => {
		const plan = scenarioPlan({noiseBudgetDb: 150});
		const applied = settingsOfFit(computeCurve(plan).fit);
		const map = logLevelMap(60);
		const levels: number[][] = [];
		const predicted: number[][] = [];
		for (let s = 0; s < 30; s++) {
			const {frame, region} = speckleFrame({plan, truth: plan, applied, seed: 500 + s, widthPx: 120, cmPerPixel: 0.1});
			const mask = maskNonSpeckle(frame, region, map, 3);
			const bands = measureBands(frame, region, mask, map);
			levels.push(bands.map((b) => b.levelDb));
			predicted.push(bands.map((b) => b.sdDb));
		}
		// Pool the squared deviations over all bands: 16 bands × 29 degrees of freedom.
		let realised = 0;
		let expected = 0;
		let dof = 0;
		for (let b = 0; b < bandRows({columns: [0, 1], rows: [0, 160], topRowCm: 0, cmPerPixel: 0.1}).length; b++) {
			const v = levels.map((l) => l[b]!);
			const m = v.reduce((a, x) => a + x, 0) / v.length;
			realised += v.reduce((a, x) => a + (x - m) ** 2, 0);
			expected += predicted.reduce((a, l) => a + l[b]! ** 2, 0) * ((v.length - 1) / v.length);
			dof += v.length - 1;
		}
		const ratio = Math.sqrt(realised / expected);
		expect(dof).toBeGreaterThan(400);
		expect(ratio).toBeGreaterThan(0.85);
		expect(ratio).toBeLessThan(1.15);
	});
});
