/**
 * The console's reducer: every key press and every effect result goes through here, so the whole
 * stepper can be driven and tested without rendering. Pure: side effects are queued in
 * `state.effects` and carried out by the app, which reports back with a result action.
 */
import type {PlanDocument} from '../../plan/plan-schema.js';
import type {ConsoleState, Overlay, StepId, SweepExport} from './console-state.js';
import {nextPicture, stepIds} from './console-state.js';
import {resolveIntent, type Intent, type KeyFlags, type Mode} from './key-intents.js';
import {formatNumber, nudge} from './number-field.js';
import {
	clonePlan,
	addLayer,
	customCopy,
	moveLayer,
	removeLayer,
	setLayerTissue,
	standardReference,
} from '../../plan/plan-edits.js';
import {budgetReceiveOf, choiceFields, cycleChoice, numberFields} from './plan-fields.js';
import {receiveBudgetNotice} from './receive-budget-notice.js';
import type {StartingPoint} from './starting-point.js';
import {
	applyDoc,
	applyNumber,
	clampCursor,
	pickerTissues,
	queue,
	remember,
	setCursor,
	travel,
	withNotice,
} from './state-helpers.js';
import {tissueOf} from './row-text.js';
import {currentRow, rowsOf, type Row} from './step-rows.js';
import {openScannerPanel, scannerIntent, scannerResult} from './scanner-reducer.js';
import type {ScannerAction, ScannerOverlay} from './scanner-state.js';
import {openSweep, sweepIntent, sweepTypingIntent} from './sweep-reducer.js';
import {maxColumnOffset} from './sweep-view-model.js';
import {eraseIn, openEntry, printableChars, typeInto} from './text-entry.js';
import {filteredTissues, tissueFilterMax} from './tissue-filter.js';
import {editNumberIntent, editTextIntent} from './typing-reducer.js';
import {refineDone, refineIntent, startRefine} from './refine-reducer.js';
import type {RefineResult} from '../../analysis/refine-image.js';
import type {PhantomImage} from '../../calibration/phantom-image.js';

export type Action =
	| {readonly type: 'key'; readonly input: string; readonly key: KeyFlags}
	| {readonly type: 'resize'; readonly isWide: boolean; readonly columns?: number; readonly rows?: number}
	| {readonly type: 'effects-taken'; readonly count: number}
	| {readonly type: 'loaded'; readonly name: string; readonly plan: PlanDocument; readonly isPreset: boolean}
	| {readonly type: 'saved'; readonly name: string}
	| {readonly type: 'save-exists'; readonly name: string}
	| {readonly type: 'exported'; readonly files: readonly string[]}
	| {
			readonly type: 'export-exists';
			readonly dir: string;
			readonly files: readonly string[];
			readonly sweep?: SweepExport;
	  }
	| {readonly type: 'compare-loaded'; readonly index: number; readonly name: string; readonly plan: PlanDocument}
	| {readonly type: 'failed'; readonly message: string}
	| {readonly type: 'refined'; readonly still: PhantomImage; readonly result: RefineResult}
	| {readonly type: 'refine-failed'; readonly problem: string}
	| {readonly type: 'starting-points'; readonly points: readonly StartingPoint[]; readonly problems: readonly string[]}
	| ScannerAction;

export function modeOf(s: ConsoleState): Mode {
	const o = s.overlay;
	if (o) {
		if (o.kind === 'ask') return 'ask';
		if (o.kind === 'name' || o.kind === 'path') return 'edit-text';
		if (o.kind === 'tissue') return 'tissue';
		if (o.kind === 'scanner') {
			if (o.panel.kind === 'result' && o.panel.naming) return 'edit-text';
			return o.panel.kind === 'path' || (o.panel.kind === 'build' && o.panel.typing !== null) ? 'edit-path' : 'scanner';
		}
		return 'overlay';
	}
	if (s.refine.phase !== 'closed') return s.refine.phase === 'pick' ? 'refine-pick' : 'refine';
	if (s.sweep.isOpen) return s.sweep.typing ? 'edit-list' : 'sweep';
	if (s.editing) return currentRow(s)?.kind === 'tissue-label' ? 'edit-text' : 'edit-number';
	if (s.isWide && s.pane === 'curve' && s.step !== 'curve') return 'curve-pane';
	if (s.step === 'stack' && s.openLayer === null) return 'stack';
	return 'browse';
}

function goStep(s: ConsoleState, step: StepId): ConsoleState {
	return clampCursor({
		...s,
		step,
		pane: 'step',
		openLayer: step === 'stack' ? s.openLayer : null,
		refusal: null,
		returnStep: null,
	});
}

function askQuit(s: ConsoleState): ConsoleState {
	if (!s.dirty) return queue(s, {kind: 'exit'});
	return {
		...s,
		overlay: {
			kind: 'ask',
			question: 'This plan has changes not saved as a preset. Quit anyway? (y/n)',
			then: {kind: 'quit'},
		},
	};
}

function openSave(s: ConsoleState): ConsoleState {
	return {...s, overlay: {kind: 'name', ...openEntry(s.presetName ?? s.doc.name)}};
}

function openTissuePicker(s: ConsoleState, layer: number): ConsoleState {
	const t = s.doc.layers[layer]?.tissue;
	const found = typeof t === 'string' ? pickerTissues.findIndex((p) => p.id === t) : pickerTissues.length;
	return {...s, overlay: {kind: 'tissue', layer, cursor: Math.max(0, found)}};
}

function enterRow(s: ConsoleState, row: Row): ConsoleState {
	switch (row.kind) {
		case 'number': {
			const v = numberFields[row.key].get(s.doc, row.index);
			const spec = numberFields[row.key].spec;
			return {
				...s,
				editing: {rowId: row.id, ...openEntry(v === undefined ? '' : formatNumber(v, spec))},
				refusal: null,
			};
		}
		case 'tissue-label': {
			const t = s.doc.layers[row.index]?.tissue;
			return {
				...s,
				editing: {rowId: row.id, ...openEntry(typeof t === 'string' ? '' : (t?.label ?? ''))},
				refusal: null,
			};
		}
		case 'choice':
			return changeChoice(s, row, 1);
		case 'start': {
			if (!s.dirty) return queue(s, {kind: 'load', pointId: row.point.id});
			const question = `Start again from "${row.point.name}"? The current changes are not saved. (y/n)`;
			return {...s, overlay: {kind: 'ask', question, then: {kind: 'load', pointId: row.point.id}}};
		}
		case 'layer':
			return setCursor({...s, openLayer: row.index, refusal: null}, 'stack', 0);
		case 'slider':
			return s;
		case 'action':
			return runRowAction(s, row);
	}
}

/** The open layer's first custom value row (its name), where typing custom values starts. */
function firstCustomRow(s: ConsoleState): number {
	return Math.max(
		0,
		rowsOf(s, 'stack').findIndex((r) => r.kind === 'tissue-label'),
	);
}

function runRowAction(s: ConsoleState, row: Row & {kind: 'action'}): ConsoleState {
	switch (row.action) {
		case 'add-layer': {
			const next = addLayer(s.doc, s.doc.layers.length - 1);
			const after = applyDoc(s, next, row.id);
			return after.doc === s.doc ? after : setCursor(after, 'stack', after.doc.layers.length);
		}
		case 'pick-tissue':
			return s.openLayer === null ? s : openTissuePicker(s, s.openLayer);
		case 'make-custom': {
			if (s.openLayer === null) return s;
			const layer = s.openLayer;
			const after = applyDoc(s, setLayerTissue(s.doc, layer, customCopy(s.doc.layers[layer]!.tissue)), row.id);
			return setCursor(after, 'stack', firstCustomRow(after));
		}
		case 'fill-reference': {
			const next = clonePlan(s.doc);
			next.reference = standardReference(s.doc, s.origin.layers);
			return withNotice(
				applyDoc(s, next, row.id),
				`Usual gains refilled from the standard layers of "${s.origin.name}".`,
			);
		}
		case 'save':
		case 'export':
		case 'sweep':
			return runCommand(s, row.action);
		case 'refine':
			return startRefine(s);
	}
}

/** Save, export and the fat sweep: one path whether asked by key or by their row on step 5. */
function runCommand(s: ConsoleState, command: 'save' | 'export' | 'sweep'): ConsoleState {
	switch (command) {
		case 'save':
			return openSave(s);
		case 'export':
			return {...s, overlay: {kind: 'path', ...openEntry(s.exportFolder)}};
		case 'sweep':
			return openSweep(s);
	}
}

function changeChoice(s: ConsoleState, row: Row & {kind: 'choice'}, direction: 1 | -1): ConsoleState {
	const field = choiceFields[row.key];
	const value = cycleChoice(field, field.get(s.doc), direction);
	const next = field.set(s.doc, value, {standardReference: () => standardReference(s.doc, s.origin.layers)});
	const after = applyDoc(s, next, row.id);
	const notice = after.doc === s.doc ? null : receiveBudgetNotice(s.doc, after.doc);
	return notice
		? withNotice(
				after,
				notice,
				budgetReceiveOf(after.doc) === (after.doc.probe.receive ?? 'fundamental') ? 'info' : 'warning',
			)
		: after;
}

function nudgeRow(s: ConsoleState, row: Row, direction: 1 | -1, isCoarse: boolean): ConsoleState {
	if (row.kind === 'choice') return changeChoice(s, row, direction);
	const target =
		row.kind === 'number'
			? row
			: row.kind === 'layer'
				? ({kind: 'number', id: row.id, key: 'thickness', index: row.index} as const)
				: undefined;
	if (!target) return s;
	const field = numberFields[target.key];
	const current = field.get(s.doc, target.index);
	if (current === undefined) return enterRow(s, row);
	const r = nudge(current, field.spec, direction, isCoarse);
	if (!r.ok) return {...s, refusal: {rowId: row.id, message: r.message}};
	return applyNumber(s, target, r.value);
}

function stackIntent(s: ConsoleState, intent: Intent, row: Row | undefined): ConsoleState | undefined {
	const layer = row?.kind === 'layer' ? row.index : undefined;
	switch (intent) {
		case 'layer-add': {
			const below = layer ?? -1;
			const after = applyDoc(s, addLayer(s.doc, below), row?.id ?? 'a:add-layer');
			return after.doc === s.doc ? after : setCursor(after, 'stack', below + 2);
		}
		case 'layer-remove': {
			if (layer === undefined) return s;
			if (s.doc.layers.length <= 1)
				return {...s, refusal: {rowId: row!.id, message: 'refused: a plan needs at least one layer'}};
			const gone = `${layer + 1} ${tissueOf(s.doc, layer)?.label ?? 'layer'}`;
			const after = clampCursor(applyDoc(s, removeLayer(s.doc, layer), row!.id));
			return after.doc === s.doc ? after : withNotice(after, `Removed layer ${gone}; u brings it back.`);
		}
		case 'thickness-mode': {
			if (layer === undefined) return s;
			const mode = s.doc.layers[layer]!.thicknessAs === 'displayed' ? 'true' : 'displayed';
			const next = clonePlan(s.doc);
			next.layers[layer]!.thicknessAs = mode;
			const word = mode === 'displayed' ? 'as measured on screen' : 'as true thickness';
			return withNotice(applyDoc(s, next, row!.id), `Layer ${layer + 1}: the same number now read ${word}.`);
		}
		case 'layer-up':
		case 'layer-down': {
			if (layer === undefined) return s;
			const delta = intent === 'layer-up' ? -1 : 1;
			const next = moveLayer(s.doc, layer, delta);
			if (next === s.doc) return s;
			return setCursor(applyDoc(s, next, row!.id), 'stack', layer + 1 + delta);
		}
		case 'tissue':
			return layer === undefined ? s : openTissuePicker(s, layer);
		default:
			return undefined;
	}
}

function browseIntent(s: ConsoleState, intent: Intent, input: string, mode: Mode): ConsoleState {
	const rows = rowsOf(s);
	const row = currentRow(s);
	const here = s.cursors[s.step];
	if (mode === 'stack') {
		const done = stackIntent(s, intent, row);
		if (done) return done;
	}
	switch (intent) {
		case 'up':
		case 'down': {
			const d = intent === 'up' ? -1 : 1;
			if (mode === 'curve-pane')
				return setCursor(s, 'curve', Math.max(0, Math.min(s.doc.sliders.count - 1, s.cursors.curve + d)));
			return {...setCursor(s, s.step, Math.max(0, Math.min(rows.length - 1, here + d))), refusal: null};
		}
		case 'prev-step':
		case 'next-step': {
			const i = stepIds.indexOf(s.step) + (intent === 'prev-step' ? -1 : 1);
			return i < 0 || i >= stepIds.length ? s : goStep(s, stepIds[i]!);
		}
		case 'jump': {
			const step = stepIds[Number(input) - 1]!;
			// Jumping to the curve remembers where from, so Tab goes back there (not to step 1).
			const from = step === 'curve' && s.step !== 'curve' ? s.step : s.step === 'curve' ? s.returnStep : null;
			return {...goStep(s, step), returnStep: step === 'curve' ? from : null};
		}
		case 'pane':
			if (s.isWide) return s.step === 'curve' ? s : {...s, pane: s.pane === 'step' ? 'curve' : 'step'};
			if (s.step !== 'curve') return {...goStep(s, 'curve'), returnStep: s.step};
			if (s.returnStep === null)
				return withNotice(s, 'Tab goes back to the step you came from; here use 1-4 or ← for a step.');
			return goStep(s, s.returnStep);
		case 'undo':
		case 'redo':
			return travel(s, intent);
		case 'back':
			if (mode === 'curve-pane') return {...s, pane: 'step'};
			if (s.step === 'stack' && s.openLayer !== null)
				return setCursor({...s, openLayer: null, refusal: null}, 'stack', s.openLayer + 1);
			if (s.step === 'start') return withNotice(s, 'This is the first step; q quits.');
			return goStep(s, stepIds[stepIds.indexOf(s.step) - 1]!);
		case 'enter':
			return mode === 'curve-pane' || !row ? s : enterRow(s, row);
		case 'nudge-up':
		case 'nudge-down':
		case 'coarse-up':
		case 'coarse-down':
			return row ? nudgeRow(s, row, intent.endsWith('up') ? 1 : -1, intent.startsWith('coarse')) : s;
		case 'help':
			return {...s, overlay: {kind: 'help'}};
		case 'warnings':
			return {...s, overlay: {kind: 'warnings'}};
		case 'compare':
			return {...s, overlay: {kind: 'compare', index: -1}};
		case 'picture':
			return {...s, picture: nextPicture(s.picture, s.isWide)};
		case 'scanner':
			return openScannerPanel(s);
		case 'refine-image':
			return startRefine(s);
		case 'quit':
			return askQuit(s);
		case 'save':
		case 'export':
		case 'sweep':
			return runCommand(s, intent);
		default:
			return s;
	}
}

function tissueIntent(s: ConsoleState, o: Overlay & {kind: 'tissue'}, intent: Intent, input: string): ConsoleState {
	const list = filteredTissues(o.filter ?? '');
	const last = list.length; // the custom row
	// Letters (j and k too) narrow the list; the arrows move.
	const isLetter = (intent === 'up' || intent === 'down') && input !== '';
	if (intent === 'type' || intent === 'erase' || isLetter) {
		const entry = {text: o.filter ?? '', isFresh: false};
		const next = intent === 'erase' ? eraseIn(entry) : typeInto(entry, printableChars(input), tissueFilterMax);
		return {...s, overlay: {...o, filter: next.text, cursor: 0}};
	}
	switch (intent) {
		case 'up':
		case 'down':
			return {...s, overlay: {...o, cursor: Math.max(0, Math.min(last, o.cursor + (intent === 'up' ? -1 : 1)))}};
		case 'back':
			return {...s, overlay: null};
		case 'enter': {
			const picked = list[o.cursor];
			const tissue = picked?.id ?? customCopy(s.doc.layers[o.layer]!.tissue);
			const after = applyDoc({...s, overlay: null}, setLayerTissue(s.doc, o.layer, tissue), `l:${o.layer}`);
			// Custom values are typed in the layer's own form, so open it on the first value.
			if (!picked) {
				const opened = {...after, step: 'stack' as const, openLayer: o.layer};
				return setCursor(opened, 'stack', firstCustomRow(opened));
			}
			return after;
		}
		default:
			return s;
	}
}

/** ← → in the side-by-side view: the starting plan, then each starting point in the list (templates, saved presets). */
function stepCompare(s: ConsoleState, o: Overlay & {kind: 'compare'}, direction: 1 | -1): ConsoleState {
	const count = s.startingPoints.length + 1;
	const index = ((o.index + 1 + direction + count) % count) - 1;
	if (index < 0) return {...s, overlay: {kind: 'compare', index}};
	const point = s.startingPoints[index]!;
	return queue({...s, overlay: {kind: 'compare', index}}, {kind: 'load-compare', pointId: point.id, index});
}

function askIntent(s: ConsoleState, o: Overlay & {kind: 'ask'}, intent: Intent): ConsoleState {
	if (intent === 'no')
		return withNotice({...s, overlay: null}, o.then.kind === 'quit' ? 'Still here.' : 'Nothing changed.');
	if (intent !== 'yes') return s;
	const closed = {...s, overlay: null};
	switch (o.then.kind) {
		case 'quit':
			return queue(closed, {kind: 'exit'});
		case 'load':
			return queue(closed, {kind: 'load', pointId: o.then.pointId});
		case 'overwrite':
			return queue(closed, {kind: 'save', name: o.then.name, overwrite: true});
		case 'replace-export':
			return queue(closed, {
				kind: 'export',
				dir: o.then.dir,
				replace: true,
				...(o.then.sweep ? {sweep: o.then.sweep} : {}),
			});
	}
}

function keyPress(s: ConsoleState, input: string, key: KeyFlags): ConsoleState {
	const mode = modeOf(s);
	const resolved = resolveIntent(mode, input, key);
	if (!resolved) return s;
	const {intent} = resolved;
	if (intent === 'exit-now') return queue(s, {kind: 'exit'});
	const o = s.overlay;
	switch (mode) {
		case 'overlay':
			if (o?.kind === 'compare' && (intent === 'prev-step' || intent === 'next-step'))
				return stepCompare(s, o, intent === 'next-step' ? 1 : -1);
			return intent === 'back' || intent === 'help' ? {...s, overlay: null} : s;
		case 'ask':
			return askIntent(s, o as Overlay & {kind: 'ask'}, intent);
		case 'tissue':
			return tissueIntent(s, o as Overlay & {kind: 'tissue'}, intent, input);
		case 'edit-text':
			return o?.kind === 'scanner' ? scannerIntent(s, o, intent, input) : editTextIntent(s, intent, input);
		case 'edit-number':
			return editNumberIntent(s, intent, input);
		case 'edit-list':
			return sweepTypingIntent(s, intent, input);
		case 'scanner':
		case 'edit-path':
			return scannerIntent(s, o as ScannerOverlay, intent, input);
		case 'refine-pick':
		case 'refine':
			return intent === 'help' ? {...s, overlay: {kind: 'help'}} : refineIntent(s, intent, input);
		case 'sweep':
			return (
				sweepIntent(s, intent) ??
				(intent === 'help' ? {...s, overlay: {kind: 'help'}} : intent === 'quit' ? askQuit(s) : s)
			);
		default:
			return clampCursor(browseIntent(s, intent, input, mode));
	}
}

export function consoleReducer(s: ConsoleState, a: Action): ConsoleState {
	switch (a.type) {
		case 'key':
			// A notice shown whole gives the key hints their line back at the next key.
			return keyPress(
				s.notice?.isWhole ? {...s, notice: {text: s.notice.text, tone: s.notice.tone}} : s,
				a.input,
				a.key,
			);
		case 'resize': {
			const columns = a.columns ?? s.columns;
			const rows = a.rows ?? s.rows;
			const column = Math.min(s.sweep.column, maxColumnOffset(s.doc.sliders.count, s.sweep.isDelta, columns));
			const sized = columns === s.columns && rows === s.rows ? s : {...s, columns, rows, sweep: {...s.sweep, column}};
			return a.isWide === s.isWide ? sized : {...sized, isWide: a.isWide, pane: 'step', returnStep: null};
		}
		case 'effects-taken':
			return {...s, effects: s.effects.slice(a.count)};
		case 'loaded':
			return withNotice(
				{
					...remember(s),
					doc: a.plan,
					origin: {name: a.name, layers: structuredClone(a.plan.layers), doc: a.plan},
					dirty: false,
					step: 'stack',
					cursors: {...s.cursors, stack: 0, probe: 0, usual: 0, curve: 0},
					openLayer: null,
					editing: null,
					refusal: null,
					presetName: a.isPreset ? a.name : null,
				},
				`Started from "${a.name}".`,
				'done',
			);
		case 'saved': {
			const twin = s.startingPoints.some(
				(p) => p.kind !== 'preset' && p.name.trim().toLowerCase() === a.name.trim().toLowerCase(),
			);
			const mark = twin ? ' Step 1 marks it "(your preset)" beside the template of that name.' : '';
			return withNotice(
				{...s, dirty: false, presetName: a.name, doc: {...s.doc, name: a.name}},
				`Saved as preset "${a.name}".${mark}`,
				'done',
			);
		}
		case 'save-exists':
			return {
				...s,
				overlay: {
					kind: 'ask',
					question: `A preset named "${a.name}" exists. Replace it? (y/n)`,
					then: {kind: 'overwrite', name: a.name},
				},
			};
		case 'exported': {
			// The full path of the first file, then the others' endings (same folder, same name up to a dot).
			const [first = '', ...rest] = a.files;
			const names = a.files.map((f) => f.slice(f.lastIndexOf('/') + 1));
			const shared = names.reduce((p, n) => {
				let i = 0;
				while (i < p.length && p[i] === n[i]) i++;
				return p.slice(0, i);
			}, names[0] ?? '');
			const stem = shared.slice(0, Math.max(0, shared.lastIndexOf('.')));
			const others = rest
				.map((f) => f.slice(f.lastIndexOf('/') + 1))
				.map((b) => (stem && b.startsWith(`${stem}.`) ? b.slice(stem.length) : b));
			const all = [first, ...others];
			const said = all.length > 1 ? `${all.slice(0, -1).join(', ')} and ${all.at(-1)}` : first;
			return {...s, notice: {text: `Wrote ${said}`, tone: 'done', isWhole: true}};
		}
		case 'export-exists': {
			const n = a.files.length;
			const question = `Replace the ${n > 1 ? `${n} files` : 'file'} already there? (y/n)  ${a.files.join(', ')} in ${a.dir}`;
			return {
				...s,
				overlay: {
					kind: 'ask',
					question,
					then: {kind: 'replace-export', dir: a.dir, ...(a.sweep ? {sweep: a.sweep} : {})},
				},
			};
		}
		case 'failed':
			return {...s, notice: {text: a.message, tone: 'warning', isWhole: true}};
		case 'refined':
			return refineDone(s, {still: a.still, result: a.result});
		case 'refine-failed':
			return refineDone(s, {problem: a.problem});
		case 'compare-loaded': {
			const o = s.overlay;
			// Only if the view is still open on that entry (a fast ← → may have moved on).
			if (o?.kind !== 'compare' || o.index !== a.index) return s;
			return {...s, overlay: {...o, against: {name: a.name, plan: a.plan}}};
		}
		case 'starting-points':
			return clampCursor({...s, startingPoints: a.points, storeProblems: a.problems});
		case 'scanner-profiles':
		case 'scanner-measured':
		case 'scanner-refused':
		case 'scanner-folder':
			return scannerResult(s, a);
	}
}
