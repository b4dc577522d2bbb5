/**
 * The probe step's physics rows: spectrum steepness, beam angle, receive mode and the mode the noise
 * budget is for, driven by key presses through the reducer. Their ranges are the plan format's
 * (the issue: steepness 1–10, angle 0–80°), so the console refuses what a plan file would.
 */
import {describe, expect, it} from 'vitest';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {limits, parsePlanDocument} from '../../src/plan/plan-schema.js';
import {consoleReducer} from '../../src/ui/state/console-reducer.js';
import {createInitialState, type ConsoleState} from '../../src/ui/state/console-state.js';
import {noFlags, type KeyFlags} from '../../src/ui/state/key-intents.js';
import {choiceFields, numberFields} from '../../src/ui/state/plan-fields.js';
import {rowText} from '../../src/ui/state/row-text.js';
import {demoPoint} from '../../src/ui/state/starting-point.js';
import {currentRow, rowsOf} from '../../src/ui/state/step-rows.js';

const start = () =>
	createInitialState({doc: demoPlan(), originName: demoPoint.name, startingPoints: [demoPoint], isWide: true});

function keysIn(s: ConsoleState, ...presses: (string | Partial<KeyFlags>)[]): ConsoleState {
	return presses.reduce<ConsoleState>((state, p) => {
		const key = typeof p === 'string' ? {...noFlags, shift: /^[A-Z]$/.test(p)} : {...noFlags, ...p};
		return consoleReducer(state, {type: 'key', input: typeof p === 'string' ? p : '', key});
	}, s);
}

const enter = {return: true};
const down = {downArrow: true};

/** Probe step, cursor on the row with this id (by pressing ↓ or ↑, as a user would). */
function onRow(s: ConsoleState, id: string): ConsoleState {
	let t = keysIn(s, '3');
	const ids = rowsOf(t).map((r) => r.id);
	const move = ids.indexOf(id) < ids.indexOf(currentRow(t)?.id ?? '') ? {upArrow: true} : down;
	for (let i = 0; i < 40 && currentRow(t)?.id !== id; i++) t = keysIn(t, move);
	expect(currentRow(t)?.id).toBe(id);
	return t;
}

const valid = (s: ConsoleState) => parsePlanDocument(JSON.parse(JSON.stringify(s.doc))).ok;

describe('probe step rows for the spectrum, the angle and the receive mode', () => {
	it("lists steepness and angle beside the probe, and the budget's mode under the budget", () => {
		const ids = rowsOf(keysIn(start(), '3')).map((r) => r.id);
		expect(ids.indexOf('n:spectrumSteepness:0')).toBe(ids.indexOf('n:bandwidthFraction:0') + 1);
		expect(ids).toContain('n:angleDeg:0');
		expect(ids).toContain('c:harmonic');
		expect(ids.indexOf('c:budgetReceive')).toBe(ids.indexOf('n:noiseBudgetDb:0') + 1);
	});

	it("uses the plan format's limits", () => {
		expect(numberFields.spectrumSteepness.spec.limit).toEqual(limits.spectrumSteepness);
		expect(numberFields.angleDeg.spec.limit).toEqual(limits.angleDeg);
		expect(choiceFields.harmonic.options.map((o) => o.value)).toEqual([
			'fundamental',
			'tissue-harmonic',
			'scatterer-harmonic',
		]);
	});

	it('steepness: shows 2 (the Gaussian) for an older plan, takes 5 typed, nudges by 0.5, refuses 11 and 0.5 naming 1 to 10', () => {
		let s = onRow(start(), 'n:spectrumSteepness:0');
		expect(rowText(s, currentRow(s)!).value).toBe('2');
		s = keysIn(s, enter, '5', enter);
		expect(s.doc.probe.spectrumSteepness).toBe(5);
		s = keysIn(s, '+');
		expect(s.doc.probe.spectrumSteepness).toBe(5.5);
		s = keysIn(s, enter, {backspace: true}, {backspace: true}, {backspace: true}, '1', '1', enter);
		expect(s.refusal?.message).toBe('must be a number from 1 to 10');
		expect(s.doc.probe.spectrumSteepness).toBe(5.5);
		s = keysIn(s, {escape: true, meta: true});
		expect(valid(s)).toBe(true);
	});

	it('beam angle: 0 by default, takes 30 typed, refuses 81 naming 0 to 80 °, and the curve follows', () => {
		let s = onRow(start(), 'n:angleDeg:0');
		expect(rowText(s, currentRow(s)!).value).toBe('0 °');
		s = keysIn(s, enter, {backspace: true}, '3', '0', enter);
		expect(s.doc.probe.angleDeg).toBe(30);
		expect(valid(s)).toBe(true);
		s = keysIn(s, enter, {backspace: true}, {backspace: true}, '8', '1', enter);
		expect(s.refusal?.message).toBe('must be a number from 0 to 80 °');
		expect(s.doc.probe.angleDeg).toBe(30);
	});
});

describe('the noise budget says which receive mode it is for', () => {
	it("switching to tissue harmonic with a fundamental budget says so; setting the budget's mode settles it", () => {
		let s = onRow(start(), 'c:harmonic');
		s = keysIn(s, enter);
		expect(s.doc.probe.receive).toBe('tissue-harmonic');
		expect(s.notice?.tone).toBe('warning');
		expect(s.notice?.text).toBe(
			'Noise budget is for fundamental, not tissue harmonic: reach uncalibrated; measure it in this mode.',
		);
		s = onRow(s, 'c:budgetReceive');
		expect(rowText(s, currentRow(s)!)).toEqual({label: 'Budget measured in', value: 'fundamental'});
		s = keysIn(s, enter);
		expect(s.doc.noiseBudgetReceive).toBe('tissue-harmonic');
		expect(s.notice?.tone).toBe('info');
		expect(s.notice?.text).toContain('for it too');
		expect(valid(s)).toBe(true);
	});

	it('a phantom reach carries its mode, and back to a typed budget keeps it', () => {
		let s = onRow(start(), 'c:noiseSource');
		s = keysIn(s, enter);
		expect(s.doc.phantomCalibration).toBeDefined();
		s = onRow(s, 'c:budgetReceive');
		s = keysIn(s, enter);
		expect(s.doc.phantomCalibration?.receive).toBe('tissue-harmonic');
		expect(s.notice?.text).toBe(
			'Phantom reach is for tissue harmonic, not fundamental: reach uncalibrated; measure it in this mode.',
		);
		expect(valid(s)).toBe(true);
		s = onRow(s, 'c:noiseSource');
		s = keysIn(s, enter);
		expect(s.doc.phantomCalibration).toBeUndefined();
		expect(s.doc.noiseBudgetReceive).toBe('tissue-harmonic');
	});
});
