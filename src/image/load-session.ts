/**
 * Reads a calibration session: the JSON file (bounded, untrusted), then every image it names,
 * relative to the session file. Returns the pure calibration's input; every problem is a
 * CalibrationRefusal or ImageRefusal naming the field or attribute.
 */
import {dirname, isAbsolute, resolve} from 'node:path';
import {CalibrationRefusal} from '../calibration/calibration-refusal.js';
import type {CalibrationImage, CalibrationInput} from '../calibration/scanner-calibration.js';
import {parseSession, type ScannerSession} from '../calibration/session-schema.js';
import {maxPlanBytes, readRegularFile} from '../files/bounded-read.js';
import {FileRefusedError} from '../files/file-errors.js';
import {parseStrictJson} from '../files/strict-json.js';
import {ImageRefusal} from './image-refusal.js';
import {readImageFile} from './read-image.js';

export interface LoadedSession {
	readonly session: ScannerSession;
	readonly input: CalibrationInput;
	/** Milliseconds spent reading and decoding the images (for the benchmark's split). */
	readonly decodeMs: number;
}

export interface LoadOptions {
	/** Default frame for multi-frame images that name none, 1-based. */
	readonly frame?: number;
}

/** Reads and validates the session JSON only. */
export function readSessionDocument(path: string): ScannerSession {
	let text: string;
	try {
		text = readRegularFile(path, {maxBytes: maxPlanBytes, what: 'session file'})
			.bytes.toString('utf8')
			.replace(/^\uFEFF/, '');
	} catch (error) {
		if (error instanceof FileRefusedError) throw new CalibrationRefusal('session', error.message);
		throw error;
	}
	const json = parseStrictJson(text);
	if (!json.ok) throw new CalibrationRefusal(path, json.problem);
	const parsed = parseSession(json.value);
	if (!parsed.ok) throw new CalibrationRefusal(`${path}`, parsed.errors.join('; '));
	return parsed.value;
}

/** Decodes the images of an already validated session whose image paths are relative to `baseDir`. */
export function loadSessionImages(session: ScannerSession, baseDir: string, options: LoadOptions = {}): LoadedSession {
	const started = performance.now();
	const read = (field: string, entry: {image: string; frame?: number | undefined}) => {
		const path = isAbsolute(entry.image) ? entry.image : resolve(baseDir, entry.image);
		const frame = entry.frame ?? options.frame;
		try {
			return readImageFile(path, {
				label: entry.image,
				...(frame !== undefined ? {frame} : {}),
				...(session.pixelScale ? {pixelScale: session.pixelScale} : {}),
			});
		} catch (error) {
			if (error instanceof ImageRefusal) throw new CalibrationRefusal(`${field}.image`, error.message);
			throw error;
		}
	};
	const gainSteps: CalibrationImage[] = session.gainSteps.map((g, i) => ({
		name: g.image,
		field: `gainSteps.${i}`,
		image: read(`gainSteps.${i}`, g),
		masterGainDb: g.masterGainDb,
	}));
	const probeInAir = session.probeInAir
		? {
				name: session.probeInAir.image,
				field: 'probeInAir',
				image: read('probeInAir', session.probeInAir),
				masterGainDb: session.probeInAir.masterGainDb,
			}
		: undefined;
	const sliderSteps = (session.sliderSteps ?? []).map((s, i) => ({
		name: s.image,
		field: `sliderSteps.${i}`,
		image: read(`sliderSteps.${i}`, s),
		masterGainDb: s.masterGainDb,
		slider: s.slider,
		position: s.position,
	}));
	const decodeMs = performance.now() - started;
	return {
		session,
		decodeMs,
		input: {
			label: session.label,
			probe: session.probe,
			displayDepthCm: session.display.depthCm,
			phantom: session.phantom,
			columns: session.region.columns,
			sliderCount: session.sliders.count,
			gainSteps,
			...(probeInAir ? {probeInAir} : {}),
			sliderSteps,
		},
	};
}

export function loadSession(path: string, options: LoadOptions = {}): LoadedSession {
	return loadSessionImages(readSessionDocument(path), dirname(resolve(path)), options);
}
