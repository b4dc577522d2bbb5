/**
 * Building a calibration session in the console instead of writing the file: the images of one
 * folder, each given a line that says what it is —
 * - `30`: a gain step at master gain 30 dB;
 * - `air 30`: the probe in air at 30 dB;
 * - `s4 +1 30`: slider 4 moved to +1 of its travel (−1…1), at 30 dB;
 * - empty: not used.
 * PNG images carry no depth scale, so a folder with any asks once for one line `0.02 0`: cm per
 * pixel and the displayed depth of the top row (cm), checked by the session format's pixelScale.
 * The probe, slider count and display depth come from the plan; the phantom is the common
 * tissue-mimicking one (0.5 dB/cm/MHz, linear, 1540 m/s; change it in a session file if yours
 * differs). The result is checked by the session format itself, so refusals name its fields. Pure.
 */
import {parseSession, sessionFormat, type ScannerSession} from '../../calibration/session-schema.js';
import type {PlanDocument} from '../../plan/plan-schema.js';

export interface BuiltImage {
	readonly name: string;
	/** What the user typed for it (see above). */
	readonly entry: string;
}

/** Image files the builder offers: DICOM stills, and PNG with a depth scale typed once for the folder. */
export function isBuilderImage(name: string): boolean {
	return /\.(dcm|dicom|png)$/i.test(name) && !name.startsWith('.');
}

/** True when an image needs the folder's depth scale (it has none of its own). */
export function needsPixelScale(name: string): boolean {
	return /\.png$/i.test(name);
}

const scaleLine = /^\s*([+-]?\d*\.?\d+(?:e[+-]?\d+)?)\s+([+-]?\d*\.?\d+)\s*$/i;

/** The depth-scale line as numbers, or a message saying how to write it (limits are the session format's). */
export function pixelScaleOf(entry: string): {cmPerPixel: number; topRowCm: number} | string {
	const m = scaleLine.exec(entry);
	if (!m) return "pixelScale: write cm per pixel and the top row's depth in cm, e.g. 0.02 0";
	return {cmPerPixel: Number(m[1]), topRowCm: Number(m[2])};
}

const numberText = '([+-]?\\d+(?:\\.\\d+)?)';
const gainOnly = new RegExp(`^${numberText}$`);
const inAir = new RegExp(`^air\\s+${numberText}$`, 'i');
const sliderStep = new RegExp(`^s(\\d+)\\s+${numberText}\\s+${numberText}$`, 'i');

type Role =
	| {readonly kind: 'skip'}
	| {readonly kind: 'gain'; readonly masterGainDb: number}
	| {readonly kind: 'air'; readonly masterGainDb: number}
	| {readonly kind: 'slider'; readonly slider: number; readonly position: number; readonly masterGainDb: number};

/** What an image's line means, or a message saying how to write it. */
export function roleOf(entry: string): Role | string {
	const t = entry.trim();
	if (!t) return {kind: 'skip'};
	let m = gainOnly.exec(t);
	if (m) return {kind: 'gain', masterGainDb: Number(m[1])};
	m = inAir.exec(t);
	if (m) return {kind: 'air', masterGainDb: Number(m[1])};
	m = sliderStep.exec(t);
	if (m) return {kind: 'slider', slider: Number(m[1]), position: Number(m[2]), masterGainDb: Number(m[3])};
	return 'write a master gain (30), air and a gain (air 30), or a slider, its position −1…1 and a gain (s4 +1 30); empty leaves it out';
}

/** One image's line as shown: what it was read as. */
export function roleText(entry: string): string {
	const r = roleOf(entry);
	if (typeof r === 'string') return 'not understood';
	switch (r.kind) {
		case 'skip':
			return 'not used';
		case 'gain':
			return `gain step at ${r.masterGainDb} dB`;
		case 'air':
			return `probe in air at ${r.masterGainDb} dB`;
		case 'slider':
			return `slider ${r.slider} at ${r.position > 0 ? '+' : ''}${r.position} of travel, ${r.masterGainDb} dB`;
	}
}

/** A profile name made from the folder's name (letters, digits and spaces kept). */
export function labelFor(folderName: string): string {
	const cleaned = folderName
		.replace(/[^\p{L}\p{N} ]+/gu, ' ')
		.replace(/\s+/g, ' ')
		.trim()
		.slice(0, 50);
	return cleaned ? `${cleaned} (measured in the console)` : 'Measured in the console';
}

/**
 * The session the lines describe, checked by the session format; `depthCm` is the images' own
 * display depth (read from the first image's region by the caller, else the plan's).
 */
export function buildSession(
	images: readonly BuiltImage[],
	doc: PlanDocument,
	label: string,
	depthCm = doc.display.depthCm,
	/** The folder's depth-scale line, when it holds PNG images. */
	scale?: string,
): {ok: true; session: ScannerSession} | {ok: false; message: string} {
	let pixelScale: {cmPerPixel: number; topRowCm: number} | undefined;
	if (images.some((im) => needsPixelScale(im.name) && im.entry.trim())) {
		const parsed = pixelScaleOf(scale ?? '');
		if (typeof parsed === 'string') return {ok: false, message: parsed};
		pixelScale = parsed;
	}
	const gainSteps: {image: string; masterGainDb: number}[] = [];
	const sliderSteps: {image: string; slider: number; position: number; masterGainDb: number}[] = [];
	let probeInAir: {image: string; masterGainDb: number} | undefined;
	for (const image of images) {
		const r = roleOf(image.entry);
		if (typeof r === 'string') return {ok: false, message: `${image.name}: ${r}`};
		if (r.kind === 'gain') gainSteps.push({image: image.name, masterGainDb: r.masterGainDb});
		else if (r.kind === 'slider')
			sliderSteps.push({image: image.name, slider: r.slider, position: r.position, masterGainDb: r.masterGainDb});
		else if (r.kind === 'air') {
			if (probeInAir)
				return {
					ok: false,
					message: `${image.name}: probeInAir: one image only (${probeInAir.image} is already the probe in air)`,
				};
			probeInAir = {image: image.name, masterGainDb: r.masterGainDb};
		}
	}
	const parsed = parseSession({
		format: sessionFormat,
		label,
		probe: {centerMhz: doc.probe.centerMhz, bandwidthFraction: doc.probe.bandwidthFraction},
		display: {depthCm},
		phantom: {alphaDbPerCmMhz: 0.5, exponent: 1, speedMps: 1540},
		region: {columns: [0.3, 0.7]},
		sliders: {count: doc.sliders.count},
		gainSteps,
		...(probeInAir ? {probeInAir} : {}),
		...(sliderSteps.length ? {sliderSteps} : {}),
		...(pixelScale ? {pixelScale} : {}),
	});
	return parsed.ok ? {ok: true, session: parsed.value} : {ok: false, message: parsed.errors.join('; ')};
}
