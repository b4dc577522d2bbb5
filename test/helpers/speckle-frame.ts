/**
 * A minimal seeded speckle frame for the image-analysis tests (simulated; its truth is known):
 * complex Gaussian scatter blurred over a few pixels, echo a = 10^((G−L)/20)·s + 10^((G−N)/20)·n
 * per row (G delivered gain, L true loss, N noise budget), grey = 255·(dB − (top − DR))/DR
 * (shared method notes §6; Burckhardt 1978 for the speckle model, from memory).
 */
import {pathModelOf} from '../../src/engine/compensation-curve.js';
import type {EnginePlan} from '../../src/engine/types.js';
import {assumedRamp, deliveredGainDb, type AppliedSettings} from '../../src/analysis/applied-gain.js';
import type {GreyFrame, MeasuredRegion} from '../../src/analysis/grey-frame.js';
import {mulberry32} from '../../src/simulate/seeded-random.js';

export interface FrameOptions {
	/** Plan that says what the scanner delivered (settings are applied on its ramp). */
	readonly plan: EnginePlan;
	/** The patient as it truly is (loss model). */
	readonly truth: EnginePlan;
	readonly applied: AppliedSettings;
	readonly seed: number;
	readonly widthPx?: number;
	readonly cmPerPixel?: number;
	readonly dynamicRangeDb?: number;
	/** Level shown white, dB re the reference scatterer under the skin. */
	readonly topDb?: number;
	/** Lateral / axial blur, px (box half-widths). */
	readonly blurPx?: readonly [number, number];
	/** An anechoic disc: centre depth, centre column fraction, radius (cm). */
	readonly cyst?: {readonly depthCm: number; readonly x: number; readonly radiusCm: number};
	/** A bright specular line: depth, column fractions, thickness px, dB above tissue. */
	readonly line?: {
		readonly depthCm: number;
		readonly from: number;
		readonly to: number;
		readonly px: number;
		readonly db: number;
	};
	/** No scatterers at all (noise only). */
	readonly anechoic?: boolean;
}

export function speckleFrame(o: FrameOptions): {frame: GreyFrame; region: MeasuredRegion} {
	const width = o.widthPx ?? 200;
	const cm = o.cmPerPixel ?? 0.05;
	const height = Math.round(o.plan.display.depthCm / cm);
	const dr = o.dynamicRangeDb ?? 60;
	const top = o.topDb ?? 28;
	const [bx, by] = o.blurPx ?? [1, 1];
	const rnd = mulberry32(o.seed);
	const gauss = () => {
		const u = Math.max(1e-12, rnd());
		const v = rnd();
		return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
	};
	const blurred = (): [Float64Array, Float64Array] => {
		const re = new Float64Array(width * height);
		const im = new Float64Array(width * height);
		for (let i = 0; i < re.length; i++) {
			re[i] = gauss() / Math.SQRT2;
			im[i] = gauss() / Math.SQRT2;
		}
		const box = (a: Float64Array, dx: number, dy: number, h: number): Float64Array => {
			const out = new Float64Array(a.length);
			for (let r = 0; r < height; r++) {
				for (let c = 0; c < width; c++) {
					let s = 0;
					for (let k = -h; k <= h; k++) {
						const rr = Math.min(height - 1, Math.max(0, r + k * dy));
						const cc = Math.min(width - 1, Math.max(0, c + k * dx));
						s += a[rr * width + cc]!;
					}
					out[r * width + c] = s / Math.sqrt(2 * h + 1);
				}
			}
			return out;
		};
		return [box(box(re, 1, 0, bx), 0, 1, by), box(box(im, 1, 0, bx), 0, 1, by)];
	};
	const [sRe, sIm] = blurred();
	const [nRe, nIm] = blurred();
	const model = pathModelOf(o.truth);
	const grey = new Uint8Array(width * height);
	for (let r = 0; r < height; r++) {
		const d = (r + 0.5) * cm;
		const g = deliveredGainDb(o.plan, o.applied, assumedRamp, d);
		const echo = 10 ** ((g - model.lossAt(d)) / 20);
		const noise = 10 ** ((g - o.plan.noiseBudgetDb) / 20);
		for (let c = 0; c < width; c++) {
			const i = r * width + c;
			let e = o.anechoic ? 0 : echo;
			if (o.cyst) {
				const dx = (c / width - o.cyst.x) * width * cm;
				const dy = d - o.cyst.depthCm;
				if (dx * dx + dy * dy < o.cyst.radiusCm ** 2) e = 0;
			}
			let re = e * sRe[i]! + noise * nRe[i]!;
			const im = e * sIm[i]! + noise * nIm[i]!;
			const ln = o.line;
			if (ln && Math.abs(d - ln.depthCm) < (ln.px * cm) / 2 && c >= ln.from * width && c < ln.to * width) {
				re += echo * 10 ** (ln.db / 20);
			}
			const db = 10 * Math.log10(re * re + im * im + 1e-30);
			grey[i] = Math.max(0, Math.min(255, Math.round((255 * (db - (top - dr))) / dr)));
		}
	}
	const region: MeasuredRegion = {
		columns: [Math.round(0.3 * width), Math.round(0.7 * width)],
		rows: [0, height],
		topRowCm: 0,
		cmPerPixel: cm,
	};
	return {frame: {width, height, grey}, region};
}
