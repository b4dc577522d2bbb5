/**
 * Non-speckle structures drawn into a simulated patient image, so the analysis can be tested on what
 * it must leave out: an anechoic cyst-like disc (no scatterers inside, only the scanner's noise) and
 * a bright specular line (a strong, smooth reflector: a fixed level well above the tissue, little
 * speckle). Positions are fractions of the image region's width and displayed depths in cm; the
 * caller records them in the truth file.
 */
import type {EchoImage} from './echo-image.js';
import type {SpeckleFields} from './speckle-field.js';

export interface CystSpec {
	/** Centre: fraction of the region's width, displayed depth cm. */
	readonly centreX: number;
	readonly centreCm: number;
	readonly radiusCm: number;
}

export interface BrightLineSpec {
	/** Left and right ends as fractions of the region's width. */
	readonly fromX: number;
	readonly toX: number;
	readonly depthCm: number;
	readonly thicknessCm: number;
	/** Level of the line above the mean tissue echo at its depth, dB. */
	readonly aboveTissueDb: number;
}

export interface PatientStructures {
	readonly cyst?: CystSpec;
	readonly brightLine?: BrightLineSpec;
}

/** Where the demo patient's structures sit: inside the measured middle columns, in the deep layer. */
export function demoStructures(depthCm: number, options: {cyst: boolean; brightLine: boolean}): PatientStructures {
	return {
		...(options.cyst ? {cyst: {centreX: 0.5, centreCm: 0.3 * depthCm, radiusCm: 0.04 * depthCm}} : {}),
		...(options.brightLine
			? {brightLine: {fromX: 0.42, toX: 0.56, depthCm: 0.2 * depthCm, thicknessCm: 0.1, aboveTissueDb: 18}}
			: {}),
	};
}

/**
 * The echo image with the structures drawn in (a new image; the input is not changed).
 * `rowLossDb`: the round-trip loss of each row, to place the line relative to the tissue there.
 */
export function drawStructures(
	image: EchoImage,
	fields: SpeckleFields,
	rowLossDb: readonly number[],
	noiseBudgetDb: number,
	cmPerRow: number,
	structures: PatientStructures,
): EchoImage {
	const {width, height} = image;
	const echoDb = new Float32Array(image.echoDb);
	// Pixels are square in the region (the speckle fields assume it too), so cmPerRow also scales x.
	const noiseAmp = 10 ** (-noiseBudgetDb / 20);
	const {cyst, brightLine} = structures;
	if (cyst) {
		const cx = cyst.centreX * width;
		const cy = cyst.centreCm / cmPerRow;
		const r = cyst.radiusCm / cmPerRow;
		for (let y = Math.max(0, Math.floor(cy - r)); y <= Math.min(height - 1, Math.ceil(cy + r)); y++) {
			for (let x = Math.max(0, Math.floor(cx - r)); x <= Math.min(width - 1, Math.ceil(cx + r)); x++) {
				if ((x - cx) ** 2 + (y - cy) ** 2 > r * r) continue;
				const i = y * width + x;
				const re = noiseAmp * fields.noise.re[i]!;
				const im = noiseAmp * fields.noise.im[i]!;
				const intensity = re * re + im * im;
				echoDb[i] = intensity > 0 ? 10 * Math.log10(intensity) : -300;
			}
		}
	}
	if (brightLine) {
		const y0 = Math.max(0, Math.round((brightLine.depthCm - brightLine.thicknessCm / 2) / cmPerRow));
		const y1 = Math.min(height - 1, Math.round((brightLine.depthCm + brightLine.thicknessCm / 2) / cmPerRow));
		const x0 = Math.max(0, Math.floor(brightLine.fromX * width));
		const x1 = Math.min(width - 1, Math.ceil(brightLine.toX * width));
		for (let y = y0; y <= y1; y++) {
			const loss = rowLossDb[y]!;
			if (Number.isNaN(loss)) continue;
			// A smooth reflector: a steady level with a small ripple from the speckle field, not full speckle.
			for (let x = x0; x <= x1; x++) {
				const i = y * width + x;
				const ripple = 0.3 * fields.echo.re[i]!;
				echoDb[i] = -loss + brightLine.aboveTissueDb + ripple;
			}
		}
	}
	return {width, height, echoDb};
}
