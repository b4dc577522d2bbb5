/** The console's reducer on its own: key presses in, state and queued effects out. */
import {describe, expect, it} from 'vitest';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {consoleReducer, modeOf} from '../../src/ui/state/console-reducer.js';
import {createInitialState, type ConsoleState} from '../../src/ui/state/console-state.js';
import {modes, noFlags, resolveIntent, type KeyFlags} from '../../src/ui/state/key-intents.js';
import {demoPoint} from '../../src/ui/state/starting-point.js';
import {applyDoc} from '../../src/ui/state/state-helpers.js';
import {currentRow} from '../../src/ui/state/step-rows.js';

const start = (isWide = true) =>
	createInitialState({
		doc: demoPlan(),
		originName: demoPoint.name,
		startingPoints: [
			demoPoint,
			{id: 'upper-abdomen', name: 'Upper abdomen', region: 'upper-abdomen', kind: 'template'},
		],
		isWide,
	});

function keysIn(s: ConsoleState, ...presses: (string | Partial<KeyFlags>)[]): ConsoleState {
	return presses.reduce<ConsoleState>((state, p) => {
		const key = typeof p === 'string' ? {...noFlags, shift: /^[A-Z]$/.test(p)} : {...noFlags, ...p};
		return consoleReducer(state, {type: 'key', input: typeof p === 'string' ? p : '', key});
	}, s);
}

const enter = {return: true};
const esc = {escape: true, meta: true};
const down = {downArrow: true};

describe('key table', () => {
	it('reads a lone Esc (which also sets meta on Ink 6.8) as back, not as a meta chord', () => {
		expect(resolveIntent('browse', '', {...noFlags, escape: true, meta: true})?.intent).toBe('back');
		expect(resolveIntent('ask', '', {...noFlags, escape: true, meta: true})?.intent).toBe('no');
	});

	it('gives digits to the number being typed but uses them to jump steps otherwise', () => {
		expect(resolveIntent('edit-number', '3', noFlags)?.intent).toBe('type');
		expect(resolveIntent('browse', '3', noFlags)?.intent).toBe('jump');
	});

	it('Ctrl+C exits from every mode', () => {
		for (const mode of modes) expect(resolveIntent(mode, 'c', {...noFlags, ctrl: true})?.intent, mode).toBe('exit-now');
	});
});

describe('console reducer', () => {
	it('jumps to steps by digit and walks them with arrows and Esc', () => {
		let s = keysIn(start(), '3');
		expect(s.step).toBe('probe');
		s = keysIn(s, {rightArrow: true}, 'l');
		expect(s.step).toBe('curve');
		s = keysIn(s, esc);
		expect(s.step).toBe('usual');
	});

	it('edits a number by typing, and a refusal keeps the old value', () => {
		let s = keysIn(start(), '3', enter, '9', '9', enter);
		expect(s.refusal?.message).toBe('must be a number above 0 and up to 50 MHz');
		expect(s.doc.probe.centerMhz).toBe(3.5);
		expect(modeOf(s)).toBe('edit-number');
		s = keysIn(s, {backspace: true}, {backspace: true}, '5', enter);
		expect(s.doc.probe.centerMhz).toBe(5);
		expect(s.dirty).toBe(true);
		expect(modeOf(s)).toBe('browse');
	});

	it('Esc cancels an edit without changing the plan', () => {
		const s = keysIn(start(), '3', enter, '7', esc);
		expect(s.doc.probe.centerMhz).toBe(3.5);
		expect(s.dirty).toBe(false);
		expect(s.editing).toBeNull();
	});

	it('quitting a clean plan queues exit; a changed one asks first', () => {
		expect(keysIn(start(), 'q').effects).toEqual([{kind: 'exit'}]);
		const asked = keysIn(start(), '3', '+', 'q');
		expect(asked.overlay?.kind).toBe('ask');
		expect(asked.effects).toEqual([]);
		expect(keysIn(asked, 'y').effects).toEqual([{kind: 'exit'}]);
		expect(keysIn(asked, 'n').overlay).toBeNull();
	});

	it('saving asks for a name, queues the save, and an existing name asks before replacing', () => {
		let s = keysIn(start(), 's');
		expect(s.overlay).toMatchObject({kind: 'name', text: 'Demo – deep liver through thick fat'});
		s = keysIn(s, 'B', 'e', 'd', ' ', '7', enter);
		expect(s.effects).toEqual([{kind: 'save', name: 'Bed 7', overwrite: false}]);
		s = consoleReducer(consoleReducer(s, {type: 'effects-taken', count: 1}), {type: 'save-exists', name: 'Bed 7'});
		expect(s.overlay?.kind).toBe('ask');
		s = keysIn(s, 'y');
		expect(s.effects).toEqual([{kind: 'save', name: 'Bed 7', overwrite: true}]);
		s = consoleReducer(s, {type: 'saved', name: 'Bed 7'});
		expect(s.dirty).toBe(false);
		expect(s.notice?.text).toContain('Saved as preset "Bed 7"');
	});

	it('refuses an empty preset name', () => {
		let s = keysIn(start(), 's', {backspace: true});
		for (let i = 0; i < 60; i++) s = keysIn(s, {backspace: true});
		s = keysIn(s, enter);
		expect(s.overlay).toMatchObject({kind: 'name', error: 'type a name of 1 to 80 characters'});
		expect(s.effects).toEqual([]);
	});

	it('loading a starting point over changes asks first, then queues the load', () => {
		let s = keysIn(start(), '3', '+', '1', down, enter);
		expect(s.overlay?.kind).toBe('ask');
		s = keysIn(s, 'y');
		expect(s.effects).toEqual([{kind: 'load', pointId: 'upper-abdomen'}]);
	});

	it('tissue stack: add, move, remove, and the last layer stays', () => {
		let s = keysIn(start(), '2', down, 'a');
		expect(s.doc.layers.map((l) => (typeof l.tissue === 'string' ? l.tissue : 'pad'))).toEqual([
			'pad',
			'soft-tissue',
			'fat',
			'muscle',
			'liver',
		]);
		expect(currentRow(s)).toMatchObject({kind: 'layer', index: 1});
		s = keysIn(s, 'J');
		expect(s.doc.layers[2]!.tissue).toBe('soft-tissue');
		expect(currentRow(s)).toMatchObject({kind: 'layer', index: 2});
		// Remove from the top until one is left, then once more.
		for (let i = 0; i < 5; i++) s = keysIn(s, {upArrow: true}, {upArrow: true}, {upArrow: true}, down, 'x');
		expect(s.doc.layers).toHaveLength(1);
		expect(s.refusal?.message).toBe('refused: a plan needs at least one layer');
	});

	it('the tissue picker sets a library tissue, or copies the values as a custom tissue', () => {
		let s = keysIn(start(), '2', down, down, down, 't');
		expect(s.overlay?.kind).toBe('tissue');
		s = keysIn(s, {upArrow: true}, {upArrow: true}, enter); // muscle, spleen, kidney
		expect(s.doc.layers[2]!.tissue).toBe('kidney');
		s = keysIn(s, 't');
		for (let i = 0; i < 40; i++) s = keysIn(s, down);
		s = keysIn(s, enter);
		expect(typeof s.doc.layers[2]!.tissue).toBe('object');
		expect(s.openLayer).toBe(2);
	});

	it('Tab: wide switches panes, narrow shows the curve step and returns', () => {
		const wide = keysIn(start(true), '3', {tab: true});
		expect(wide.pane).toBe('curve');
		expect(modeOf(wide)).toBe('curve-pane');
		expect(keysIn(wide, down).cursors.curve).toBe(1);
		const narrow = keysIn(start(false), '3', {tab: true});
		expect(narrow.step).toBe('curve');
		expect(keysIn(narrow, {tab: true}).step).toBe('probe');
	});

	it("usual gains: switching on fills them from the starting plan's standard layers", () => {
		const s = keysIn(start(), '4', enter);
		expect(s.doc.reference?.slidersDb).toHaveLength(8);
		expect(currentRow(keysIn(s, down))).toMatchObject({kind: 'number', key: 'refMasterDb'});
	});
});

describe('keys that arrive together', () => {
	it('are split into one press each, so "\\r7\\r" is Enter, 7, Enter', async () => {
		const {splitKeys} = await import('../../src/ui/state/key-intents.js');
		const presses = splitKeys('\r7\r', noFlags);
		expect(presses.map((p) => [p.input, p.key.return])).toEqual([
			['', true],
			['7', false],
			['', true],
		]);
		expect(splitKeys('J', {...noFlags, shift: true})).toEqual([{input: 'J', key: {...noFlags, shift: true}}]);
		expect(splitKeys('aJ\u0003', noFlags).map((p) => [p.input, p.key.shift, p.key.ctrl])).toEqual([
			['a', false, false],
			['J', true, false],
			['c', false, true],
		]);
		// Esc read together with the next key comes as meta + key: it is Esc, then the key.
		expect(splitKeys('3', {...noFlags, meta: true}).map((p) => [p.input, p.key.escape, p.key.meta])).toEqual([
			['', true, true],
			['3', false, false],
		]);
		let s = start();
		for (const p of [...splitKeys('2', noFlags), ...splitKeys('\r7\r', noFlags)])
			s = consoleReducer(s, {type: 'key', ...p});
		expect(s.doc.layers[1]).toEqual({tissue: 'fat', thicknessCm: 7, thicknessAs: 'displayed'});
	});
});

describe('a plan the schema refuses never reaches the state', () => {
	// The plan format allows 1 to 40 layers (src/plan/plan-schema.ts); a 41st is the simplest refused edit.
	const fortyLayers = () => {
		const s = start();
		const doc = structuredClone(s.doc);
		doc.layers = Array.from({length: 40}, (_, i) => ({
			tissue: i === 39 ? 'liver' : 'soft-tissue',
			thicknessCm: 0.5,
			thicknessAs: 'true' as const,
		}));
		return {...s, doc};
	};

	it('applyDoc keeps the old plan and puts the refusal beside the row', () => {
		const s = fortyLayers();
		const next = structuredClone(s.doc);
		next.layers.push({tissue: 'liver', thicknessCm: 1, thicknessAs: 'true'});
		const after = applyDoc(s, next, 'a:add-layer');
		expect(after.doc).toBe(s.doc);
		expect(after.dirty).toBe(false);
		expect(after.refusal).toEqual({
			rowId: 'a:add-layer',
			message: expect.stringMatching(/layers: must be a list of 1 to 40 layers/),
		});
	});

	it('adding a 41st layer with the a key is refused the same way', () => {
		const s = keysIn(fortyLayers(), '2', 'a');
		expect(s.doc.layers).toHaveLength(40);
		expect(s.refusal?.message).toMatch(/layers: must be a list of 1 to 40 layers/);
	});
});
