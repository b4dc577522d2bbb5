/**
 * The simulated echo before any gain: per pixel, 10·log10|a|² with
 * a = 10^(−L/20)·s + 10^(−N/20)·n (L the row's loss, N the noise budget, s and n the unit speckle and
 * noise fields). Gain adds the same dB to echo and noise, so this map is computed once per plan
 * geometry and every gain change is a re-map of grey (see grey-image.ts).
 */
import type {RowEchoes} from './echo-rows.js';
import type {SpeckleFields} from './speckle-field.js';

export interface EchoImage {
	readonly width: number;
	readonly height: number;
	/** 10·log10 of the echo-plus-noise intensity, dB re the reference echo at the skin. */
	readonly echoDb: Float32Array;
}

/** Floor for a pixel that happens to be exactly 0 (never in practice), dB. */
const floorDb = -300;

export function echoImage(fields: SpeckleFields, rows: RowEchoes, noiseBudgetDb: number): EchoImage {
	const {width, height} = fields;
	const echoDb = new Float32Array(width * height);
	const noiseAmp = 10 ** (-noiseBudgetDb / 20);
	const {echo, noise} = fields;
	for (let r = 0; r < height; r++) {
		const loss = rows.lossDb[r]!;
		const echoAmp = Number.isNaN(loss) ? 0 : 10 ** (-loss / 20);
		const start = r * width;
		for (let i = start; i < start + width; i++) {
			const re = echoAmp * echo.re[i]! + noiseAmp * noise.re[i]!;
			const im = echoAmp * echo.im[i]! + noiseAmp * noise.im[i]!;
			const intensity = re * re + im * im;
			echoDb[i] = intensity > 0 ? 10 * Math.log10(intensity) : floorDb;
		}
	}
	return {width, height, echoDb};
}

/** Mean intensity level of a row, dB (echo and noise powers add), before gain. */
export function rowMeanLevelDb(lossDb: number, noiseBudgetDb: number): number {
	const echo = Number.isNaN(lossDb) ? 0 : 10 ** (-lossDb / 10);
	return 10 * Math.log10(echo + 10 ** (-noiseBudgetDb / 10));
}
