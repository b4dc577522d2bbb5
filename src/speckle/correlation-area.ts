/**
 * How many pixels one independent speckle cell covers. Pixels are not cells: the band-mean variance
 * is σ²_px·S/N_px, with S the area under the central lobe of the image's autocorrelation
 * coefficient (shared method notes, §1; on processed images this holds where the
 * speckle-SD rule fails). S is estimated on the measured pixels themselves, as the product of the
 * lateral and axial lobe integrals (exact for a separable correlation). The patient-image bands and
 * the scanner calibration both count their cells here.
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
	/**
	 * Take each row's deviations from that row's own mean, so a depth trend down a tall window (a
	 * phantom's attenuation) does not read as axial correlation. @default false: one mean for all
	 */
	readonly rowMeans?: boolean;
}

/** The value each row's pixels deviate from: the window's mean, or the row's own. */
function rowCentres(w: PixelWindow, mean: number): Float64Array {
	const centre = new Float64Array(w.rows[1]).fill(mean);
	if (!w.rowMeans) return centre;
	for (let r = w.rows[0]; r < w.rows[1]; r++) {
		let s = 0;
		let n = 0;
		for (let c = w.columns[0]; c < w.columns[1]; c++) {
			if (!w.use[r * w.width + c]) continue;
			s += w.grey[r * w.width + c]!;
			n++;
		}
		centre[r] = n ? s / n : mean;
	}
	return centre;
}

function lobeSum(w: PixelWindow, centre: Float64Array, variance: number, dx: number, dy: number): number {
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
				acc += (w.grey[row + c]! - centre[r]!) * (w.grey[rowB + c + ox]! - centre[r + oy]!);
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
	const centre = rowCentres(w, mean);
	// The lobes are normalised by the spread about the same centres they are taken around.
	const spread = w.rowMeans ? residualVariance(w, centre) : variance;
	if (!(spread > 0)) return {count: n, mean, variance, cellAreaPx: 1};
	const lateral = 1 + 2 * lobeSum(w, centre, spread, 1, 0);
	const axial = 1 + 2 * lobeSum(w, centre, spread, 0, 1);
	return {count: n, mean, variance, cellAreaPx: Math.max(1, lateral * axial)};
}

function residualVariance(w: PixelWindow, centre: Float64Array): number {
	let acc = 0;
	let n = 0;
	for (let r = w.rows[0]; r < w.rows[1]; r++) {
		for (let c = w.columns[0]; c < w.columns[1]; c++) {
			if (!w.use[r * w.width + c]) continue;
			const d = w.grey[r * w.width + c]! - centre[r]!;
			acc += d * d;
			n++;
		}
	}
	return n > 1 ? acc / (n - 1) : 0;
}
