/**
 * A small, seeded speckle phantom series for the calibration tests, whose truth the test knows.
 * Invented scanner: a depth response with a focal hump, thermal noise at a fixed budget, log or
 * power-law grey map, optional mild smoothing after compression.
 *
 * Speckle: a complex Gaussian field blurred separably and normalised to unit mean intensity
 * (Burckhardt 1978, from memory); echo per row a = 10^((G+R−L)/20)·s + 10^((G+R−N)/20)·n
 * (shared reference §6); grey = 255·((20·log10|a| − (top − DR))/DR)^γ, clipped.
 */
import type {PhantomImage} from '../../src/calibration/phantom-image.js';
import {phantomLossDb, type PhantomMaterial, type ProbeSpectrum} from '../../src/calibration/phantom-loss.js';
import {basisWeights, knotDepths} from '../../src/engine/slider-basis.js';
import {mulberry32} from '../../src/simulate/seeded-random.js';

export interface SeriesOptions {
	seed: number;
	width?: number;
	height?: number;
	depthCm?: number;
	/** Grey-map exponent γ (1 = logarithmic). */
	gamma?: number;
	/** Box smoothing after compression, pixels either side (0 = none). */
	smoothPx?: number;
	gainsDb?: number[];
	noiseBudgetDb?: number;
	sliderCount?: number;
	/** Slider moved in the slider-step image (1-based) and its travel truth. */
	slider?: number;
	sliderTravelDb?: number;
	/** Lines of burned-in colour inside the image (masked by the reader's colour rule in real files). */
	topDb?: number;
	dynamicRangeDb?: number;
}

export const testProbe: ProbeSpectrum = {centerMhz: 3.5, bandwidthFraction: 0.6};
export const testPhantom: PhantomMaterial = {alphaDbPerCmMhz: 0.5, exponent: 1, speedMps: 1540};

/** The invented scanner's own depth gain: a ramp a little short of the phantom's loss, plus a focal hump. */
export function trueDepthResponseDb(z: number): number {
	return 2.4 * z + 6 * Math.exp(-(((z - 6) / 3) ** 2));
}

/** Unit-mean-intensity correlated complex speckle (re, im interleaved), blurred 3 px laterally, 2 px axially. */
function speckleField(width: number, height: number, rand: () => number): Float64Array {
	const n = width * height;
	const f = new Float64Array(2 * n);
	for (let i = 0; i < n; i++) {
		const r = Math.sqrt(-2 * Math.log(1 - rand()));
		const t = 2 * Math.PI * rand();
		f[2 * i] = r * Math.cos(t);
		f[2 * i + 1] = r * Math.sin(t);
	}
	const out = new Float64Array(2 * n);
	for (let y = 0; y < height; y++) {
		for (let x = 0; x < width; x++) {
			let re = 0;
			let im = 0;
			for (let dy = 0; dy < 2; dy++) {
				for (let dx = -1; dx <= 1; dx++) {
					const xx = Math.min(width - 1, Math.max(0, x + dx));
					const yy = Math.min(height - 1, y + dy);
					re += f[2 * (yy * width + xx)]!;
					im += f[2 * (yy * width + xx) + 1]!;
				}
			}
			out[2 * (y * width + x)] = re;
			out[2 * (y * width + x) + 1] = im;
		}
	}
	let power = 0;
	for (let i = 0; i < n; i++) power += out[2 * i]! ** 2 + out[2 * i + 1]! ** 2;
	const k = 1 / Math.sqrt(power / n);
	for (let i = 0; i < 2 * n; i++) out[i] = out[i]! * k;
	return out;
}

export interface SeriesTruth {
	gammaMap: (levelDb: number) => number;
	/** Level shown at a mean grey (numerically inverted mean-grey curve of unit speckle). */
	levelAtMeanGrey: (grey: number) => number;
	depthResponse: (z: number) => number;
	penetrationCm: number;
	sliderTravelDb: number;
}

export interface Series {
	gainSteps: Array<{image: PhantomImage; masterGainDb: number; grey: Uint8Array}>;
	probeInAir: {image: PhantomImage; masterGainDb: number; grey: Uint8Array};
	sliderStep: {image: PhantomImage; masterGainDb: number; slider: number; position: number; grey: Uint8Array};
	truth: SeriesTruth;
	width: number;
	height: number;
	depthCm: number;
}

export function makeSeries(o: SeriesOptions): Series {
	const width = o.width ?? 400;
	const height = o.height ?? 400;
	const depthCm = o.depthCm ?? 16;
	const gamma = o.gamma ?? 1;
	const top = o.topDb ?? 46;
	const dr = o.dynamicRangeDb ?? 60;
	const budget = o.noiseBudgetDb ?? 40;
	const gains = o.gainsDb ?? [0, 6, 12, 18, 24, 30, 36];
	const sliderCount = o.sliderCount ?? 8;
	const slider = o.slider ?? 4;
	const travel = o.sliderTravelDb ?? 10;
	const rand = mulberry32(o.seed);
	const speckle = speckleField(width, height, rand);
	const cmPerRow = depthCm / height;
	const depthAt = (y: number) => (y + 0.5) * cmPerRow;
	const knots = knotDepths(
		{count: sliderCount, knots: 'band-centres', ends: 'flat', minDb: -1, maxDb: 1, rampDbPerCmMhz: 0},
		depthCm,
	);
	const rowEcho = Array.from(
		{length: height},
		(_, y) => trueDepthResponseDb(depthAt(y)) - phantomLossDb(testPhantom, testProbe, depthAt(y)),
	);
	const rowNoise = Array.from({length: height}, (_, y) => trueDepthResponseDb(depthAt(y)) - budget);
	const gammaMap = (db: number) => 255 * Math.min(1, Math.max(0, (db - (top - dr)) / dr)) ** gamma;

	const render = (gainDb: number, echoOn: boolean, sliderDb: number): Uint8Array => {
		const noise = speckleField(width, height, rand);
		const raw = new Float64Array(width * height);
		for (let y = 0; y < height; y++) {
			const extra = sliderDb ? sliderDb * basisWeights(knots, 'flat', depthAt(y))[slider - 1]! : 0;
			const ae = echoOn ? 10 ** ((gainDb + extra + rowEcho[y]!) / 20) : 0;
			const an = 10 ** ((gainDb + extra + rowNoise[y]!) / 20);
			for (let x = 0; x < width; x++) {
				const i = y * width + x;
				const re = ae * speckle[2 * i]! + an * noise[2 * i]!;
				const im = ae * speckle[2 * i + 1]! + an * noise[2 * i + 1]!;
				raw[i] = gammaMap(10 * Math.log10(re * re + im * im + 1e-30));
			}
		}
		const r = o.smoothPx ?? 0;
		const out = new Uint8Array(width * height);
		for (let y = 0; y < height; y++) {
			for (let x = 0; x < width; x++) {
				let s = 0;
				let n = 0;
				for (let dy = -r; dy <= r; dy++) {
					for (let dx = -r; dx <= r; dx++) {
						const yy = y + dy;
						const xx = x + dx;
						if (yy < 0 || yy >= height || xx < 0 || xx >= width) continue;
						s += raw[yy * width + xx]!;
						n++;
					}
				}
				out[y * width + x] = Math.round(s / n);
			}
		}
		return out;
	};
	const asImage = (grey: Uint8Array): PhantomImage => ({
		width,
		height,
		grey: Float32Array.from(grey),
		mask: new Uint8Array(width * height),
		region: {x0: 0, y0: 0, x1: width - 1, y1: height - 1},
		rows: {originCm: cmPerRow / 2, cmPerRow},
		cmPerColumn: cmPerRow,
		depthScaleFrom: 'pixel-scale',
		notes: [],
	});
	const gainSteps = gains.map((g) => {
		const grey = render(g, true, 0);
		return {image: asImage(grey), masterGainDb: g, grey};
	});
	const airGain = gains[gains.length - 1]!;
	const airGrey = render(airGain, false, 0);
	const sliderGain = gains[Math.floor(gains.length / 2)]!;
	const sliderGrey = render(sliderGain, true, travel);

	// Mean grey of unit speckle at level X: E[map(X + 10·log10 I)], I exponential (fully developed speckle).
	const meanGreyAt = (x: number) => {
		let s = 0;
		const m = 2000;
		for (let k = 0; k < m; k++) {
			const u = (k + 0.5) / m;
			s += gammaMap(x + 10 * Math.log10(-Math.log(u)));
		}
		return s / m;
	};
	const levels = Array.from({length: 1201}, (_, i) => -30 + i * 0.1);
	const greys = levels.map(meanGreyAt);
	const levelAtMeanGrey = (g: number) => {
		for (let i = 1; i < greys.length; i++) {
			if (greys[i]! >= g) return levels[i - 1]! + ((g - greys[i - 1]!) / (greys[i]! - greys[i - 1]!)) * 0.1;
		}
		return Number.NaN;
	};
	// ENR 0 dB where the phantom's loss equals the budget.
	let penetrationCm = Number.NaN;
	for (let z = 0.01; z < 40; z += 0.01) {
		if (phantomLossDb(testPhantom, testProbe, z) >= budget) {
			penetrationCm = z;
			break;
		}
	}
	return {
		gainSteps,
		probeInAir: {image: asImage(airGrey), masterGainDb: airGain, grey: airGrey},
		sliderStep: {image: asImage(sliderGrey), masterGainDb: sliderGain, slider, position: 1, grey: sliderGrey},
		truth: {gammaMap, levelAtMeanGrey, depthResponse: trueDepthResponseDb, penetrationCm, sliderTravelDb: travel},
		width,
		height,
		depthCm,
	};
}
