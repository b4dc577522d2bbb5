/**
 * Small pure steps the reducers share: notices, queued effects, cursors, and taking a new plan
 * only when the plan format accepts it.
 */
import {allLibraryTissues} from '../../engine/tissue-library.js';
import {parsePlanDocument, type PlanDocument} from '../../plan/plan-schema.js';
import {historyLimit, type ConsoleState, type Effect, type Notice, type StepId} from './console-state.js';
import {numberFields} from './plan-fields.js';
import {rowsOf, type Row} from './step-rows.js';

/** The library as the tissue picker lists it; one more row after it is for custom values. */
export const pickerTissues = allLibraryTissues();

export const withNotice = (s: ConsoleState, text: string, tone: Notice['tone'] = 'info'): ConsoleState => ({
	...s,
	notice: {text, tone},
});
export const queue = (s: ConsoleState, e: Effect): ConsoleState => ({...s, effects: [...s.effects, e]});
export const setCursor = (s: ConsoleState, step: StepId, value: number): ConsoleState => ({
	...s,
	cursors: {...s.cursors, [step]: value},
});

/** Keeps the current step's cursor on a real row after the rows changed. */
export function clampCursor(s: ConsoleState): ConsoleState {
	const n = rowsOf(s).length;
	const c = Math.max(0, Math.min(s.cursors[s.step], n - 1));
	return c === s.cursors[s.step] ? s : setCursor(s, s.step, c);
}

/** Takes a new plan if the plan format accepts it; otherwise the refusal goes beside the row. */
export function applyDoc(s: ConsoleState, next: PlanDocument, rowId: string): ConsoleState {
	const r = parsePlanDocument(next);
	if (!r.ok) return {...s, refusal: {rowId, message: r.errors[0] ?? 'refused'}};
	return {...remember(s), doc: r.value, dirty: true, refusal: null, editing: null, notice: null};
}

/** Keeps the current plan for undo (every plan edit goes through here), and drops the redo list. */
export function remember(s: ConsoleState): ConsoleState {
	const past = [...s.history.past, s.doc].slice(-historyLimit);
	return {...s, history: {past, future: []}};
}

/** Steps back (`undo`) or forward (`redo`) through the plan's edits; a notice says what happened. */
export function travel(s: ConsoleState, direction: 'undo' | 'redo'): ConsoleState {
	const {past, future} = s.history;
	if (direction === 'undo') {
		const previous = past[past.length - 1];
		if (!previous) return withNotice(s, 'Nothing to undo.');
		const after = {
			...s,
			doc: previous,
			dirty: true,
			editing: null,
			refusal: null,
			history: {past: past.slice(0, -1), future: [s.doc, ...future]},
		};
		return withNotice(clampCursor(after), `Undid one change (${past.length - 1} more to undo; Ctrl+R redoes).`);
	}
	const next = future[0];
	if (!next) return withNotice(s, 'Nothing to redo.');
	const after = {
		...s,
		doc: next,
		dirty: true,
		editing: null,
		refusal: null,
		history: {past: [...past, s.doc], future: future.slice(1)},
	};
	return withNotice(clampCursor(after), `Redid one change (${future.length - 1} more to redo).`);
}

export function applyNumber(s: ConsoleState, row: Row & {kind: 'number'}, value: number): ConsoleState {
	const field = numberFields[row.key];
	const problem = field.check?.(s.doc, row.index, value);
	if (problem) return {...s, refusal: {rowId: row.id, message: problem}};
	return applyDoc(s, field.set(s.doc, row.index, value), row.id);
}
