/**
 * Writes a simulated phantom series as files — DICOM (MONOCHROME2 and RGB, a border, burned-in
 * coloured text outside the tissue region, a coloured marker inside it) or PNG (grey and RGB mixed)
 * — plus the session file, as a user's export would look.
 */
import {mkdirSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {encode} from 'fast-png';
import {writeDicom} from './dicom-fixture.js';
import {makeSeries, type Series, type SeriesOptions} from './phantom-speckle.js';

const border = {left: 20, top: 30, right: 20, bottom: 10};

/** Grey image (w × h) inside a frame with a border and coloured "text" above the region; RGB when asked. */
function framed(
	grey: Uint8Array,
	w: number,
	h: number,
	rgb: boolean,
): {data: Uint8Array; width: number; height: number} {
	const width = w + border.left + border.right;
	const height = h + border.top + border.bottom;
	const channels = rgb ? 3 : 1;
	const data = new Uint8Array(width * height * channels).fill(24);
	for (let y = 0; y < h; y++) {
		for (let x = 0; x < w; x++) {
			const v = grey[y * w + x]!;
			const i = ((y + border.top) * width + x + border.left) * channels;
			for (let c = 0; c < channels; c++) data[i + c] = v;
		}
	}
	// Burned-in label: bright grey outside the region (must not be read), coloured when RGB.
	for (let y = 8; y < 20; y++) {
		for (let x = 40; x < 200; x++) {
			const i = (y * width + x) * channels;
			if (rgb) data.set([255, 220, 0], i);
			else data[i] = 250;
		}
	}
	// A coloured depth marker inside the measured columns (RGB only): masked by the colour rule.
	if (rgb) {
		for (let y = border.top + 100; y < border.top + 130; y++) {
			for (let x = border.left + w / 2 - 3; x < border.left + w / 2 + 3; x++)
				data.set([0, 200, 255], (y * width + x) * 3);
		}
	}
	return {data, width, height};
}

export interface WrittenSession {
	readonly dir: string;
	readonly sessionPath: string;
	readonly series: Series;
	readonly session: Record<string, unknown>;
}

export function writeSession(
	dir: string,
	format: 'dicom' | 'png',
	options: SeriesOptions,
	edit?: (session: Record<string, unknown>) => void,
): WrittenSession {
	mkdirSync(dir, {recursive: true});
	const series = makeSeries(options);
	const {width: w, height: h, depthCm} = series;
	const cmPerRow = depthCm / h;
	let n = 0;
	const write = (grey: Uint8Array, stem: string): string => {
		const rgb = n++ % 2 === 1; // every other image in colour, so sessions mix both
		const f = framed(grey, w, h, rgb);
		if (format === 'png') {
			const name = `${stem}.png`;
			writeFileSync(
				join(dir, name),
				encode({width: f.width, height: f.height, data: f.data, channels: rgb ? 3 : 1, depth: 8}),
			);
			return name;
		}
		const name = `${stem}.dcm`;
		const region = {
			minX0: border.left,
			minY0: border.top,
			maxX1: border.left + w - 1,
			maxY1: border.top + h - 1,
			refValueY: cmPerRow / 2,
			deltaY: cmPerRow,
		};
		writeFileSync(
			join(dir, name),
			writeDicom({
				rows: f.height,
				columns: f.width,
				pixels: f.data,
				photometric: rgb ? 'RGB' : 'MONOCHROME2',
				samples: rgb ? 3 : 1,
				...(rgb ? {planar: 0 as const} : {}),
				regions: [region],
			}),
		);
		return name;
	};
	const gainSteps = series.gainSteps.map((g) => ({
		image: write(g.grey, `gain-${g.masterGainDb}`),
		masterGainDb: g.masterGainDb,
	}));
	const probeInAir = {image: write(series.probeInAir.grey, 'in-air'), masterGainDb: series.probeInAir.masterGainDb};
	const s = series.sliderStep;
	const sliderSteps = [
		{
			image: write(s.grey, `slider-${s.slider}-up`),
			slider: s.slider,
			position: s.position,
			masterGainDb: s.masterGainDb,
		},
	];
	const session: Record<string, unknown> = {
		format: 'evenecho-scanner-session/1',
		label: 'Cart B, curved array, abdomen (simulated)',
		probe: {centerMhz: 3.5, bandwidthFraction: 0.6},
		display: {depthCm},
		phantom: {alphaDbPerCmMhz: 0.5, exponent: 1, speedMps: 1540},
		region: {columns: [0.3, 0.7]},
		sliders: {count: 8},
		gainSteps,
		probeInAir,
		sliderSteps,
		// PNG: row 0 of the file is the border's top; the tissue starts border.top rows down at depth 0.
		...(format === 'png' ? {pixelScale: {cmPerPixel: cmPerRow, topRowCm: -border.top * cmPerRow}} : {}),
	};
	edit?.(session);
	const sessionPath = join(dir, 'session.json');
	writeFileSync(sessionPath, JSON.stringify(session, null, 2));
	return {dir, sessionPath, series, session};
}
