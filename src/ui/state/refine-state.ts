/**
 * "Refine from an image" (step 5, key i): the panel's state as plain data. The patient's still is
 * named by a typed path (and frame), measured by an effect, shown, and its measured α0 accepted into
 * the plan (an ordinary, undoable plan edit) or discarded.
 */
import type {RefineResult} from '../../analysis/refine-image.js';
import type {PhantomImage} from '../../calibration/phantom-image.js';

export type RefineField = 'path' | 'frame' | 'settings';
export const refineFields: readonly RefineField[] = ['path', 'frame', 'settings'];

export type RefinePanel =
	| {readonly phase: 'closed'}
	| {
			readonly phase: 'pick';
			readonly path: string;
			/** Typed frame number of a multi-frame file; empty for the first. */
			readonly frame: string;
			/** Path of a settings file ({sliders, masterGainDb}) the still was taken with; empty: the plan's own fit. */
			readonly settings: string;
			readonly field: RefineField;
			readonly error: string | null;
	  }
	| {readonly phase: 'working'; readonly path: string; readonly frame: string; readonly settings: string}
	| {
			readonly phase: 'shown';
			readonly path: string;
			readonly frame: string;
			readonly settings: string;
			/** The still as read (drawn small with the mask over it). */
			readonly still: PhantomImage;
			readonly result: RefineResult;
	  };

export const closedRefine: RefinePanel = {phase: 'closed'};

/** The pick form, keeping what was typed last time. */
export function openRefine(previous: RefinePanel): RefinePanel {
	const path = previous.phase === 'closed' ? '' : previous.path;
	const frame = previous.phase === 'closed' ? '' : previous.frame;
	const settings = previous.phase === 'closed' ? '' : previous.settings;
	return {phase: 'pick', path, frame, settings, field: 'path', error: null};
}

/** The typed frame as a number, or a message; empty means none (the file's first). */
export function frameOf(text: string): {ok: true; frame: number | undefined} | {ok: false; message: string} {
	const t = text.trim();
	if (t === '') return {ok: true, frame: undefined};
	const n = Number(t);
	if (!Number.isInteger(n) || n < 1 || n > 10000)
		return {ok: false, message: `frame: a whole number from 1 (got "${t}"), or empty for the first`};
	return {ok: true, frame: n};
}
