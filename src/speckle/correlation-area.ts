/**
 * How many pixels one independent speckle cell covers. Pixels are not cells: the band-mean variance
 * is σ²_px·S/N_px, with S the area under the central lobe of the image's autocorrelation
 * coefficient (shared method notes, §1; on processed images this holds where the
 * speckle-SD rule fails). S is estimated on the measured pixels themselves, as the product of the
 * lateral and axial lobe integrals (exact for a separable correlation).
 */

/** Lags tried in each direction, px: far beyond any speckle cell at usable pixel sizes. */
const maxLagPx = 24;

/** Pixels of a rectangular window, with a mask of the ones to use. */
export interface PixelWindow {
	readonly grey: ArrayLike<number>;
	readonly use: ArrayLike<number>;
	/** Row stride of `grey` and `use`. */
	readonly width: number;
	readonly rows: readonly [first: number, end: number];
	readonly columns: readonly [first: number, end: number];
}

function lobeSum(w: PixelWindow, mean: number, variance: number, dx: number, dy: number): number {
	let sum = 0;
	for (let lag = 1; lag <= maxLagPx; lag++) {
		let acc = 0;
		let pairs = 0;
		const ox = dx * lag;
		const oy = dy * lag;
		for (let r = w.rows[0]; r + oy < w.rows[1]; r++) {
			const row = r * w.width;
			const rowB = (r + oy) * w.width;
			for (let c = w.columns[0]; c + ox < w.columns[1]; c++) {
				if (!w.use[row + c] || !w.use[rowB + c + ox]) continue;
				acc += (w.grey[row + c]! - mean) * (w.grey[rowB + c + ox]! - mean);
				pairs++;
			}
		}
		if (pairs < 20) break;
		const rho = acc / pairs / variance;
		// The lobe ends where the coefficient is no longer distinguishable from zero.
		if (rho < Math.max(0.02, 2 / Math.sqrt(pairs))) break;
		sum += rho;
	}
	return sum;
}

/**
 * Mean, variance and correlation area (px²) of the used pixels of a window; S is at least 1
 * (a pixel is never worth more than one cell).
 */
export function windowStatistics(w: PixelWindow): {count: number; mean: number; variance: number; cellAreaPx: number} {
	let n = 0;
	let s = 0;
	let s2 = 0;
	for (let r = w.rows[0]; r < w.rows[1]; r++) {
		const row = r * w.width;
		for (let c = w.columns[0]; c < w.columns[1]; c++) {
			if (!w.use[row + c]) continue;
			const g = w.grey[row + c]!;
			n++;
			s += g;
			s2 += g * g;
		}
	}
	if (n < 2) return {count: n, mean: n ? s : 0, variance: 0, cellAreaPx: 1};
	const mean = s / n;
	const variance = Math.max(0, (s2 - n * mean * mean) / (n - 1));
	if (variance === 0) return {count: n, mean, variance, cellAreaPx: 1};
	const lateral = 1 + 2 * lobeSum(w, mean, variance, 1, 0);
	const axial = 1 + 2 * lobeSum(w, mean, variance, 0, 1);
	return {count: n, mean, variance, cellAreaPx: Math.max(1, lateral * axial)};
}
