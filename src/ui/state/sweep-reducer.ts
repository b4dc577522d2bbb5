/**
 * Keys in the fat-thickness sweep of step 5: open and close it, move the cursor row, scroll the
 * columns, type a new thickness list, switch deltas, export. Pure: the table itself is not needed
 * here (row count is the list's length, column widths follow from the slider count).
 */
import {fatLayerToSweep} from '../../plan/fat-layer.js';
import type {ConsoleState} from './console-state.js';
import type {Intent} from './key-intents.js';
import {layoutFor} from '../kit/layout.js';
import {setCursor, withNotice} from './state-helpers.js';
import {rowsOf} from './step-rows.js';
import {sweepFatCm, sweepFieldText, sweepTextMax, type SweepState} from './sweep-state.js';
import {parseFatList} from './sweep-table.js';
import {maxColumnOffset} from './sweep-view-model.js';
import {eraseIn, openEntry, typeInto} from './text-entry.js';

/** Characters a thickness list can hold; anything else is refused as it is typed. */
const listChars = /^[0-9.,:+\- ]$/;

const withSweep = (s: ConsoleState, patch: Partial<SweepState>): ConsoleState => ({
	...s,
	sweep: {...s.sweep, ...patch},
});

/** Rows PgUp / PgDn move: about one screen of the table. */
export function sweepPage(s: ConsoleState): number {
	return Math.max(1, layoutFor(s.columns, s.rows).bodyRows - 9);
}

function clampColumn(s: ConsoleState, column: number, isDelta = s.sweep.isDelta): number {
	return Math.max(0, Math.min(column, maxColumnOffset(s.doc.sliders.count, isDelta, s.columns)));
}

/** Opens the table on step 5, the cursor on the plan's own thickness when the list has it. */
export function openSweep(s: ConsoleState): ConsoleState {
	const fatCm = sweepFatCm(s.sweep, s.doc);
	const layer = fatLayerToSweep(s.doc);
	const own = layer === null ? -1 : fatCm.indexOf(s.doc.layers[layer]!.thicknessCm);
	const at = rowsOf(s, 'curve').findIndex((r) => r.kind === 'action' && r.action === 'sweep');
	const onStep = setCursor(
		{...s, step: 'curve', pane: 'step', returnStep: null, openLayer: null, refusal: null, editing: null},
		'curve',
		Math.max(0, at),
	);
	return withSweep(onStep, {isOpen: true, typing: null, refusal: null, column: 0, row: Math.max(0, own)});
}

export function closeSweep(s: ConsoleState): ConsoleState {
	return withSweep(s, {isOpen: false, typing: null, refusal: null});
}

/** A key while the table is shown; undefined for keys the console handles the same everywhere (help, quit). */
export function sweepIntent(s: ConsoleState, intent: Intent): ConsoleState | undefined {
	const sw = s.sweep;
	const last = sweepFatCm(sw, s.doc).length - 1;
	const moveRow = (d: number) => withSweep(s, {row: Math.max(0, Math.min(last, sw.row + d))});
	switch (intent) {
		case 'up':
			return moveRow(-1);
		case 'down':
			return moveRow(1);
		case 'page-up':
			return moveRow(-sweepPage(s));
		case 'page-down':
			return moveRow(sweepPage(s));
		case 'scroll-left':
			return withSweep(s, {column: clampColumn(s, sw.column - 1)});
		case 'scroll-right':
			return withSweep(s, {column: clampColumn(s, sw.column + 1)});
		case 'toggle-delta':
			return withSweep(s, {isDelta: !sw.isDelta, column: clampColumn(s, sw.column, !sw.isDelta)});
		case 'enter':
			return withSweep(s, {typing: openEntry(sweepFieldText(sw, s.doc)), refusal: null});
		case 'export':
			if (fatLayerToSweep(s.doc) === null)
				return withNotice(s, 'Nothing exported: the plan has no fat layer to sweep.', 'warning');
			// The plan export's folder prompt, carrying the list and the deltas choice.
			return {
				...s,
				overlay: {
					kind: 'path',
					...openEntry(s.exportFolder),
					sweep: {fatCm: sweepFatCm(sw, s.doc), isDelta: sw.isDelta},
				},
			};
		case 'back':
			return closeSweep(s);
		default:
			return undefined;
	}
}

/** Keys while typing the thickness list. A refused list keeps the last good one (and its table). */
export function sweepTypingIntent(s: ConsoleState, intent: Intent, input: string): ConsoleState {
	const typing = s.sweep.typing!;
	const setTyping = (typed: {text: string; isFresh: boolean}) => withSweep(s, {typing: typed, refusal: null});
	switch (intent) {
		case 'back':
			return withSweep(s, {typing: null, refusal: null});
		case 'type': {
			const chars = [...input].filter((c) => listChars.test(c)).join('');
			if (!chars)
				return withSweep(s, {
					refusal: 'type numbers with commas (1,2,4,6,8) or from:to:step (1:8:1), each above 0 and up to 50 cm',
				});
			return setTyping(typeInto(typing, chars, sweepTextMax));
		}
		case 'erase':
			return setTyping(eraseIn(typing));
		case 'enter': {
			const r = parseFatList(typing.text);
			if (!r.ok) return withSweep(s, {refusal: r.message});
			return withSweep(s, {
				list: {text: typing.text.trim(), fatCm: r.fatCm},
				typing: null,
				refusal: null,
				row: Math.min(s.sweep.row, r.fatCm.length - 1),
			});
		}
		default:
			return s;
	}
}
