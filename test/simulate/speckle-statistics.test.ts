/**
 * The simulator's speckle against published statistics of fully developed speckle. Regions are
 * large enough that each tolerance is five standard errors computed from the number of independent
 * cells (pixels / cell area), the precision rule of the shared derivations (C33/C34).
 */
import {describe, expect, it} from 'vitest';
import {echoImage} from '../../src/simulate/echo-image.js';
import {rowEchoes} from '../../src/simulate/echo-rows.js';
import {speckleCellOf} from '../../src/simulate/speckle-field.js';
import {speckleFor} from '../../src/simulate/simulate-frame.js';
import {matched, plan} from '../helpers/plans.js';

/** A lossless, noiseless uniform medium: every pixel is the reference speckle at 0 dB. */
const lossless = plan([{tissue: matched('lossless scatterer', 1540, 0), thicknessCm: 100}], {bandwidthFraction: 0.6});
const width = 600;
const height = 480;

function speckleDb(seed: number): Float32Array {
	const rows = rowEchoes(lossless, height, {topRowCm: 0, cmPerRow: lossless.display.depthCm / height});
	return echoImage(speckleFor(lossless, width, height, seed), rows, lossless.noiseBudgetDb).echoDb;
}

/** Independent cells in the region: pixels over the cell area in pixels (at least one pixel). */
function independentCells(): number {
	const cell = speckleCellOf(lossless.probe);
	const cmPerPx = lossless.display.depthCm / height;
	return (width * height) / (Math.max(1, cell.axialCm / cmPerPx) * Math.max(1, cell.lateralCm / cmPerPx));
}

function moments(values: ArrayLike<number>): {mean: number; sd: number} {
	let s = 0;
	let s2 = 0;
	for (let i = 0; i < values.length; i++) {
		s += values[i]!;
		s2 += values[i]! * values[i]!;
	}
	const mean = s / values.length;
	return {mean, sd: Math.sqrt(s2 / values.length - mean * mean)};
}

const cells = independentCells();
const seeds = [1, 2, 3];

describe('speckle statistics (published constants)', () => {
	it('has enough independent cells for the tolerances below', () => {
		expect(cells).toBeGreaterThan(40_000);
	});

	for (const seed of seeds) {
		const db = speckleDb(seed);
		const amplitude = Float64Array.from(db, (v) => 10 ** (v / 20));
		const intensity = Float64Array.from(db, (v) => 10 ** (v / 10));

		it(`Rayleigh amplitude mean/SD = 1.913 (Wagner, Smith, Sandrik & Lopez 1983), seed ${seed}`, () => {
			const {mean, sd} = moments(amplitude);
			// SE of the ratio ≈ ratio·√((1/SNR² + CV of the SD²)/N) < 0.7·√(1/N) for Rayleigh; 5 SE.
			const tolerance = (5 * 0.7 * 1.913) / Math.sqrt(cells);
			expect(Math.abs(mean / sd - 1.913)).toBeLessThan(tolerance);
		});

		it(`intensity is exponential with unit mean: mean/SD = 1 (Goodman, from memory), seed ${seed}`, () => {
			const {mean, sd} = moments(intensity);
			expect(Math.abs(mean - 1)).toBeLessThan(5 / Math.sqrt(cells));
			expect(Math.abs(mean / sd - 1)).toBeLessThan((5 * 1.2) / Math.sqrt(cells));
		});

		it(`SD of 20·log10 A = 5.57 dB (Kaplan & Ma 1994), seed ${seed}`, () => {
			const {sd} = moments(db);
			// SD of a sample SD: σ·√((kurtosis − 1)/(4N)); the log-exponential kurtosis is 5.4 (derived).
			const tolerance = 5 * 5.57 * Math.sqrt(4.4 / (4 * cells));
			expect(Math.abs(sd - 5.57)).toBeLessThan(tolerance);
		});

		it(`mean of dB − dB of mean intensity = −10γ/ln 10 = −2.507 dB (derived from Kaplan & Ma 1994), seed ${seed}`, () => {
			const bias = moments(db).mean - 10 * Math.log10(moments(intensity).mean);
			// SE of the mean dB 5.57/√N plus that of the mean intensity 4.34/√N, added in the worst way.
			const tolerance = (5 * (5.57 + 4.34)) / Math.sqrt(cells);
			expect(Math.abs(bias - (-10 * 0.5772156649) / Math.LN10)).toBeLessThan(tolerance);
		});
	}
});
