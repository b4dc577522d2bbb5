/**
 * The independent-cell area on fields whose truth the test knows. White noise smoothed by a moving
 * average of L pixels has a triangular autocorrelation, ρ(k) = 1 − k/L, whose lobe integral
 * 1 + 2·Σρ is exactly L; a separable L_x × L_y average therefore has S = L_x·L_y (a derivation,
 * no source needed). A steady trend down the rows is what a phantom's attenuation adds: taken about
 * each row's own mean it changes nothing; about one mean it reads as a huge axial correlation.
 */
import {describe, expect, it} from 'vitest';
import {windowStatistics} from '../../src/speckle/correlation-area.js';
import {mulberry32} from '../../src/simulate/seeded-random.js';

/** Gaussian noise averaged over `lx` columns and `ly` rows (moving windows), plus `trendPerRow` grey per row. */
function smoothedNoise(width: number, height: number, lx: number, ly: number, trendPerRow: number): Float64Array {
	const next = mulberry32(7);
	const raw = Float64Array.from(
		{length: (width + lx) * (height + ly)},
		() => Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next()),
	);
	const out = new Float64Array(width * height);
	for (let r = 0; r < height; r++) {
		for (let c = 0; c < width; c++) {
			let s = 0;
			for (let j = 0; j < ly; j++) for (let i = 0; i < lx; i++) s += raw[(r + j) * (width + lx) + c + i]!;
			out[r * width + c] = 100 + 10 * s + trendPerRow * r;
		}
	}
	return out;
}

describe('the correlation area of a window', () => {
	const width = 200;
	const height = 200;
	const use = new Uint8Array(width * height).fill(1);
	const window = {use, width, rows: [0, height] as const, columns: [0, width] as const};

	it('is L_x·L_y = 12 for a 4 × 3 moving average (within 15 %)', () => {
		const s = windowStatistics({...window, grey: smoothedNoise(width, height, 4, 3, 0)}).cellAreaPx;
		expect(Math.abs(s / 12 - 1)).toBeLessThan(0.15);
	});

	it("taken about each row's mean, a steady trend down the rows leaves it unchanged; about one mean it does not", () => {
		const flat = windowStatistics({...window, grey: smoothedNoise(width, height, 4, 3, 0), rowMeans: true}).cellAreaPx;
		const trend = smoothedNoise(width, height, 4, 3, 1);
		const perRow = windowStatistics({...window, grey: trend, rowMeans: true}).cellAreaPx;
		expect(Math.abs(perRow / flat - 1)).toBeLessThan(0.02);
		expect(Math.abs(perRow / 12 - 1)).toBeLessThan(0.15);
		expect(windowStatistics({...window, grey: trend}).cellAreaPx).toBeGreaterThan(3 * perRow);
	});
});
