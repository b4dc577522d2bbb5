/**
 * Keys while typing: a number into a field, a tissue name, or a preset name. Pure. Every field
 * edits through the shared `text-entry` steps, so they all behave alike.
 */
import {clonePlan} from '../../plan/plan-edits.js';
import type {ConsoleState, Overlay} from './console-state.js';
import type {Intent} from './key-intents.js';
import {formatNumber, isNumberChar, nudge, parseEntry} from './number-field.js';
import {numberFields} from './plan-fields.js';
import {applyDoc, applyNumber, queue, withNotice} from './state-helpers.js';
import {currentRow} from './step-rows.js';
import {eraseIn, printableChars, typeInto} from './text-entry.js';

/** Longest preset name the plan format accepts. */
const nameMax = 80;
const tissueLabelMax = 60;
/** Longest number text kept while typing (more digits than any field shows). */
const numberTextMax = 24;

export function editNumberIntent(s: ConsoleState, intent: Intent, input: string): ConsoleState {
	const editing = s.editing!;
	const row = currentRow(s);
	if (row?.kind !== 'number') return {...s, editing: null};
	const field = numberFields[row.key];
	switch (intent) {
		case 'back':
			return {...s, editing: null, refusal: null};
		case 'type': {
			const chars = [...input].filter(isNumberChar).join('');
			if (!chars) return {...s, refusal: {rowId: row.id, message: 'numbers only: digits, a point, a minus sign'}};
			return {...s, editing: {...editing, ...typeInto(editing, chars, numberTextMax)}, refusal: null};
		}
		case 'erase':
			return {...s, editing: {...editing, ...eraseIn(editing)}};
		case 'nudge-up':
		case 'nudge-down':
		case 'coarse-up':
		case 'coarse-down': {
			const typed = parseEntry(editing.text, field.spec);
			const base = typed.ok ? typed.value : (field.get(s.doc, row.index) ?? 0);
			const r = nudge(base, field.spec, intent.endsWith('up') ? 1 : -1, intent.startsWith('coarse'));
			if (!r.ok) return {...s, refusal: {rowId: row.id, message: r.message}};
			return {...s, editing: {...editing, text: formatNumber(r.value, field.spec), isFresh: false}, refusal: null};
		}
		case 'enter': {
			const r = parseEntry(editing.text, field.spec);
			if (!r.ok) return {...s, refusal: {rowId: row.id, message: r.message}};
			return applyNumber(s, row, r.value);
		}
		default:
			return s;
	}
}

export function editTextIntent(s: ConsoleState, intent: Intent, input: string): ConsoleState {
	const o = s.overlay;
	if (o?.kind === 'path') return editPathIntent(s, o, intent, input);
	const isName = o?.kind === 'name';
	const text = isName ? o.text : (s.editing?.text ?? '');
	const isFresh = isName ? o.isFresh : (s.editing?.isFresh ?? false);
	const max = isName ? nameMax : tissueLabelMax;
	const entry = {text, isFresh};
	const setText = (t: string): ConsoleState =>
		isName
			? {...s, overlay: {kind: 'name', text: t, isFresh: false}}
			: {...s, editing: {...s.editing!, text: t, isFresh: false}, refusal: null};
	switch (intent) {
		case 'back':
			return isName ? withNotice({...s, overlay: null}, 'Not saved.') : {...s, editing: null, refusal: null};
		case 'type':
			return setText(typeInto(entry, printableChars(input), max).text);
		case 'erase':
			return setText(eraseIn(entry).text);
		case 'enter': {
			const t = text.trim();
			if (t.length === 0) {
				const error = `type a name of 1 to ${max} characters`;
				return isName
					? {...s, overlay: {kind: 'name', text, isFresh: false, error}}
					: {...s, refusal: {rowId: s.editing!.rowId, message: error}};
			}
			if (isName) return queue({...s, overlay: null}, {kind: 'save', name: t, overwrite: false});
			const row = currentRow(s);
			if (row?.kind !== 'tissue-label') return {...s, editing: null};
			const next = clonePlan(s.doc);
			const tissue = next.layers[row.index]!.tissue;
			if (typeof tissue !== 'string') tissue.label = t;
			return applyDoc(s, next, row.id);
		}
		default:
			return s;
	}
}

/** Longest folder path typed for an export. */
const pathMax = 400;

/** Keys while typing the export folder (the plan's or the fat sweep's): Enter exports there, asking first if it would replace files. */
function editPathIntent(s: ConsoleState, o: Overlay & {kind: 'path'}, intent: Intent, input: string): ConsoleState {
	switch (intent) {
		case 'back':
			return withNotice({...s, overlay: null}, 'Nothing exported.');
		case 'type':
			return {...s, overlay: {...o, ...typeInto(o, printableChars(input), pathMax)}};
		case 'erase':
			return {...s, overlay: {...o, ...eraseIn(o)}};
		case 'enter': {
			const dir = o.text.trim() || '.';
			return queue(
				{...s, overlay: null, exportFolder: dir},
				{kind: 'export', dir, replace: false, ...(o.sweep ? {sweep: o.sweep} : {})},
			);
		}
		default:
			return s;
	}
}
