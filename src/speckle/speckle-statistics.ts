/**
 * Constants of fully developed speckle and what they say about how many independent cells a band
 * mean needs. In fully developed speckle the complex echo is circular Gaussian, so the envelope is
 * Rayleigh and the intensity exponential (Burckhardt 1978; Wagner et al. 1983).
 */

/** Euler–Mascheroni constant γ. */
const eulerGamma = 0.5772156649015329;

/** Rayleigh amplitude mean / SD = √(π/2)/√(2 − π/2) ≈ 1.913 (Wagner et al. 1983). */
export const rayleighAmplitudeSnr = Math.sqrt(Math.PI / 2) / Math.sqrt(2 - Math.PI / 2);

/** SD of 20·log10 of a Rayleigh amplitude, dB: (20/ln10)·π/√24 ≈ 5.57, at any level (Kaplan & Ma 1994). */
export const logSpeckleSdDb = ((20 / Math.LN10) * Math.PI) / Math.sqrt(24);

/** Mean of the dB values less the dB of the mean intensity: −10·γ/ln10 ≈ −2.507 dB. */
export const logMeanBiasDb = (-10 * eulerGamma) / Math.LN10;

/** Two-sided 95 % normal quantile. */
export const z95 = 1.959963984540054;

/**
 * SD of a mean over `count` pixels of speckle whose cells each cover `cellAreaPx` pixels:
 * σ_px·√(S/N_px). The pixels are correlated over a cell, so N_px/S of them are independent
 * (Wagner et al. 1983).
 */
export function sdOfMean(sdPx: number, count: number, cellAreaPx: number): number {
	return sdPx * Math.sqrt(cellAreaPx / Math.max(1, count));
}

/**
 * Independent speckle cells a band mean needs for a 95 % half-width of `halfWidthDb` when each cell
 * scatters by `cellSdDb` (5.57 dB for log-compressed speckle): N = (1.96·σ/e)².
 */
export function cellsForHalfWidth(halfWidthDb: number, cellSdDb = logSpeckleSdDb): number {
	return ((z95 * cellSdDb) / halfWidthDb) ** 2;
}

/**
 * Two-sided 95 % quantile of Student's t with `dof` degrees of freedom (Cornish–Fisher expansion
 * about the normal quantile; 2.262 at 9, 2.228 at 10, within 0.002 of the tables from 3 up).
 */
export function t95(dof: number): number {
	const z = z95;
	const n = Math.max(1, dof);
	return (
		z +
		(z ** 3 + z) / (4 * n) +
		(5 * z ** 5 + 16 * z ** 3 + 3 * z) / (96 * n ** 2) +
		(3 * z ** 7 + 19 * z ** 5 + 17 * z ** 3 - 15 * z) / (384 * n ** 3)
	);
}
