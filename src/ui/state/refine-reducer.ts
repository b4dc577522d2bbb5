/**
 * Keys of the "refine from an image" panel, and the measurement's result coming back. Pure: the
 * reading and measuring is the `refine` effect's (src/ui/effects). Accepting is an ordinary plan
 * edit, so `u` undoes it.
 */
import type {RefineResult} from '../../analysis/refine-image.js';
import type {PhantomImage} from '../../calibration/phantom-image.js';
import {planWithMeasuredLayer} from '../../plan/measured-layer.js';
import type {ConsoleState} from './console-state.js';
import type {Intent} from './key-intents.js';
import {closedRefine, frameOf, openRefine, refineFields, type RefinePanel} from './refine-state.js';
import {applyDoc, queue, withNotice} from './state-helpers.js';

const pathMax = 1000;

/** `i` (or the row on step 5): opens the form; only from the curve step, where the plan's sliders are. */
export function startRefine(s: ConsoleState): ConsoleState {
	if (s.step !== 'curve') return withNotice(s, 'Refine from an image is on step 5 (Curve): press 5, then i.');
	return {...s, refine: openRefine(s.refine), notice: null};
}

function pickIntent(s: ConsoleState, p: RefinePanel & {phase: 'pick'}, intent: Intent, input: string): ConsoleState {
	const set = (next: Partial<typeof p>) => ({...s, refine: {...p, error: null, ...next}});
	switch (intent) {
		case 'back':
			return {...s, refine: closedRefine};
		case 'pane':
			return set({field: refineFields[(refineFields.indexOf(p.field) + 1) % refineFields.length]!});
		case 'type': {
			const text = input.replace(/[\r\n\t]/g, '');
			if (p.field === 'frame') return set({frame: (p.frame + text.replace(/\D/g, '')).slice(0, 5)});
			if (p.field === 'settings') return set({settings: (p.settings + text).slice(0, pathMax)});
			return set({path: (p.path + text).slice(0, pathMax)});
		}
		case 'erase':
			return set({[p.field]: p[p.field].slice(0, -1)});
		case 'enter': {
			if (p.path.trim() === '') return set({error: 'type the path of a DICOM or PNG still of the patient'});
			const f = frameOf(p.frame);
			if (!f.ok) return set({error: f.message, field: 'frame'});
			const settings = p.settings.trim();
			const working: RefinePanel = {phase: 'working', path: p.path.trim(), frame: p.frame.trim(), settings};
			return queue(
				{...s, refine: working},
				{kind: 'refine', path: p.path.trim(), ...(f.frame ? {frame: f.frame} : {}), ...(settings ? {settings} : {})},
			);
		}
		default:
			return s;
	}
}

function accept(s: ConsoleState, p: RefinePanel & {phase: 'shown'}): ConsoleState {
	const a = p.result.attenuation;
	if (!a)
		return withNotice(
			s,
			`Nothing to accept: ${p.result.cannotTell ?? 'no attenuation was measured'}. Esc closes.`,
			'warning',
		);
	const after = applyDoc(s, planWithMeasuredLayer(s.doc, a), `a:refine`);
	if (after.doc === s.doc) return after;
	const text =
		`Layer ${a.layerIndex + 1} (${a.label}): measured α0 ${a.alphaDbPerCmMhz.toFixed(2)} ` +
		`(${a.low.toFixed(2)}–${a.high.toFixed(2)}) now in the plan (u undoes); confirm live.`;
	return withNotice({...after, refine: closedRefine}, text, 'done');
}

/** Keys while the panel is open (the form, or the result). */
export function refineIntent(s: ConsoleState, intent: Intent, input: string): ConsoleState {
	const p = s.refine;
	switch (p.phase) {
		case 'closed':
			return s;
		case 'pick':
			return pickIntent(s, p, intent, input);
		case 'working':
			return s;
		case 'shown':
			if (intent === 'accept') return accept(s, p);
			if (intent === 'back')
				return withNotice({...s, refine: closedRefine}, 'Measurement discarded; the plan is unchanged.');
			if (intent === 'enter') return {...s, refine: openRefine(p)};
			return s;
	}
}

/** The measurement came back: shown, or the form again with the reason. */
export function refineDone(
	s: ConsoleState,
	outcome: {still: PhantomImage; result: RefineResult} | {problem: string},
): ConsoleState {
	const p = s.refine;
	if (p.phase !== 'working') return s;
	if ('problem' in outcome)
		return {
			...s,
			refine: {
				phase: 'pick',
				path: p.path,
				frame: p.frame,
				settings: p.settings,
				field: 'path',
				error: outcome.problem,
			},
		};
	return {
		...s,
		refine: {
			phase: 'shown',
			path: p.path,
			frame: p.frame,
			settings: p.settings,
			still: outcome.still,
			result: outcome.result,
		},
	};
}
