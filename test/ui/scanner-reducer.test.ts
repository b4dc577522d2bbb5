/**
 * The measured-scanner panel through the console's reducer alone: which keys it takes, that naming
 * a profile is one plan edit undone with u, that a stale result is dropped, and that typed control
 * characters never reach the path. The profile below is a minimal invented one; real profiles
 * come from the calibration (test/ui/scanner-console.test.tsx).
 */
import {describe, expect, it} from 'vitest';
import type {ScannerProfile} from '../../src/calibration/profile-document.js';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {consoleReducer, modeOf} from '../../src/ui/state/console-reducer.js';
import {createInitialState, type ConsoleState} from '../../src/ui/state/console-state.js';
import {noFlags, resolveIntent, type KeyFlags} from '../../src/ui/state/key-intents.js';
import type {ScannerOverlay} from '../../src/ui/state/scanner-state.js';
import {demoPoint} from '../../src/ui/state/starting-point.js';

const start = () =>
	createInitialState({doc: demoPlan(), originName: demoPoint.name, startingPoints: [demoPoint], isWide: true});

function keysIn(s: ConsoleState, ...presses: (string | Partial<KeyFlags>)[]): ConsoleState {
	return presses.reduce<ConsoleState>((state, p) => {
		const key = typeof p === 'string' ? {...noFlags, shift: /^[A-Z]$/.test(p)} : {...noFlags, ...p};
		return consoleReducer(state, {type: 'key', input: typeof p === 'string' ? p : '', key});
	}, s);
}

const profile = {id: 'cart-b', name: 'Cart B', label: 'Cart B (invented)'} as unknown as ScannerProfile;
const panel = (s: ConsoleState) => (s.overlay as ScannerOverlay).panel;

describe('the measured-scanner panel in the reducer', () => {
	it('g opens it and asks the store for the profiles; its keys only work while it is open', () => {
		expect(resolveIntent('browse', 'g', noFlags)?.intent).toBe('scanner');
		expect(resolveIntent('browse', 's', noFlags)?.intent).toBe('save');
		expect(resolveIntent('scanner', 's', noFlags)?.intent).toBe('keep');
		expect(resolveIntent('scanner', 'S', {...noFlags, shift: true})?.intent).toBe('keep-replace');
		expect(resolveIntent('edit-path', 's', noFlags)?.intent).toBe('type');
		const s = keysIn(start(), 'g');
		expect(modeOf(s)).toBe('scanner');
		expect(s.effects).toEqual([{kind: 'scanner-list'}]);
	});

	it('naming a profile is one plan edit: the plan names it, is changed, and u takes it back', () => {
		let s = keysIn(start(), 'g');
		s = consoleReducer(s, {type: 'effects-taken', count: 1});
		s = consoleReducer(s, {type: 'scanner-profiles', profiles: [profile], problems: []});
		s = keysIn(s, {downArrow: true}, {return: true});
		expect(s.overlay).toBeNull();
		expect(s.doc.scanner).toBe('cart-b');
		expect(s.dirty).toBe(true);
		s = keysIn(s, 'u');
		expect(s.doc.scanner).toBeUndefined();
		s = consoleReducer(s, {type: 'key', input: 'r', key: {...noFlags, ctrl: true}});
		expect(s.doc.scanner).toBe('cart-b');
		// Picking "none" removes the name again.
		s = keysIn(s, 'g');
		s = consoleReducer(s, {type: 'scanner-profiles', profiles: [profile], problems: []});
		expect(panel(s)).toEqual({kind: 'list', cursor: 1});
		s = keysIn(s, {upArrow: true}, {return: true});
		expect(s.doc.scanner).toBeUndefined();
	});

	it('typing the session path drops control characters, Enter queues the measurement, a late result after Esc is dropped', () => {
		let s = keysIn(start(), 'g', 'c');
		expect(modeOf(s)).toBe('edit-path');
		s = keysIn(s, 'a', '\u0007', 'b', '.json');
		expect(panel(s)).toMatchObject({kind: 'path', text: 'ab.json'});
		s = keysIn(s, {return: true});
		expect(panel(s)).toEqual({kind: 'measuring', path: 'ab.json'});
		expect(s.effects.at(-1)).toEqual({kind: 'scanner-measure', path: 'ab.json'});
		s = consoleReducer(s, {type: 'scanner-refused', message: 'session: no such file'});
		expect(panel(s)).toEqual({kind: 'path', text: 'ab.json', error: 'session: no such file'});
		s = keysIn(s, {escape: true, meta: true}, {escape: true, meta: true});
		expect(s.overlay).toBeNull();
		const late = consoleReducer(s, {type: 'scanner-measured', path: 'ab.json', input: {} as never, cal: {} as never});
		expect(late.overlay).toBeNull();
	});
});

describe('building a session from typed lines', () => {
	it('reads each line as a gain step, the probe in air, a slider step or nothing, and says how to write one it cannot read', async () => {
		const {roleOf, buildSession} = await import('../../src/ui/state/session-builder.js');
		expect(roleOf('30')).toEqual({kind: 'gain', masterGainDb: 30});
		expect(roleOf(' air 36 ')).toEqual({kind: 'air', masterGainDb: 36});
		expect(roleOf('s4 +1 30')).toEqual({kind: 'slider', slider: 4, position: 1, masterGainDb: 30});
		expect(roleOf('')).toEqual({kind: 'skip'});
		expect(roleOf('thirty')).toMatch(/write a master gain/);
		const lines = [
			{name: 'a.dcm', entry: '18'},
			{name: 'b.dcm', entry: '24'},
			{name: 'c.dcm', entry: '30'},
			{name: 'd.dcm', entry: 'air 30'},
			{name: 'e.dcm', entry: 's4 +1 30'},
		];
		const built = buildSession(lines, demoPlan(), 'Cart B (invented)');
		expect(built.ok && built.session.gainSteps.map((g) => g.image)).toEqual(['a.dcm', 'b.dcm', 'c.dcm']);
		expect(built.ok && built.session.sliderSteps?.[0]).toMatchObject({slider: 4, position: 1});
		// The session format's own checks name the field.
		const out = buildSession([...lines, {name: 'f.dcm', entry: 's4 +3 30'}], demoPlan(), 'Cart B (invented)');
		expect(out.ok ? '' : out.message).toMatch(/^sliderSteps\.1\.position/);
		const twoAir = buildSession([...lines, {name: 'f.dcm', entry: 'air 20'}], demoPlan(), 'Cart B (invented)');
		expect(twoAir.ok ? '' : twoAir.message).toMatch(/probeInAir: one image only/);
	});
});
