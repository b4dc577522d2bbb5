/**
 * Step 5's "refine from an image", driven by keystrokes: name a simulated patient still (invented:
 * a standard adult upper abdomen with a thin wall, its liver attenuating more than the plan's, a
 * cyst-like disc in the measured columns), see it drawn with the measured columns and what was left
 * out, the band levels against the plan, the slider changes and the measured α0 with its interval,
 * the cautions; accept it (undoable) or discard it; a file that is not an image is refused by name.
 * The pure steps (accepting writes the measured α0 and its interval on that layer) are checked
 * through the reducer too.
 */
import {mkdtempSync, rmSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterAll, afterEach, describe, expect, it} from 'vitest';
import {imageFiles} from '../../src/cli/simulate-command.js';
import {resolvePlan} from '../../src/plan/resolve-plan.js';
import {patientImage} from '../../src/simulate/demo-images.js';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {runEffect} from '../../src/ui/effects/console-effects.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {consoleReducer, modeOf, type Action} from '../../src/ui/state/console-reducer.js';
import {createInitialState, type ConsoleState} from '../../src/ui/state/console-state.js';
import {noFlags} from '../../src/ui/state/key-intents.js';
import {abdomenPlan} from '../helpers/plans.js';
import {keys} from '../helpers/keys.js';
import {frame, press, ready, send, type, waitForText, type Rendered} from '../helpers/press.js';

const dir = mkdtempSync(join(tmpdir(), 'evenecho-ui-refine-'));
afterAll(() => rmSync(dir, {recursive: true, force: true}));
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
});

// The plan states the noise budget the simulated scanner meets (48 dB); with the default 65 dB the
// image's own noise contradicts it and, without a profile, refine rightly says it cannot tell α0.
const doc = abdomenPlan({noiseBudgetDb: 48}, 0.5);
const still = join(dir, 'patient.dcm');
const settingsPath = join(dir, 'applied.json');
const wrongCount = join(dir, 'three-sliders.json');
writeFileSync(wrongCount, JSON.stringify({sliders: [0, 0, 0], masterGainDb: 30}));
const patient = patientImage(resolvePlan(doc), 7, 'dcm', {cyst: true, size: {width: 360, height: 200}});
writeFileSync(still, imageFiles(patient, 'dicom', 'patient', 7, doc.name)[0]!.data);
writeFileSync(settingsPath, JSON.stringify(patient.appliedSettings));
const notImage = join(dir, 'notes.txt');
writeFileSync(notImage, 'not an image\n');

async function open(columns = 100, rows = 30) {
	const app = render(
		<App
			shelf={openShelf({home: join(dir, 'home')})}
			theme={plainTheme}
			columns={columns}
			rows={rows}
			initialPlan={doc}
		/>,
	);
	apps.push(app);
	await ready(app);
	return app;
}

async function measure(app: Rendered, path: string) {
	await press(app, '5');
	await press(app, 'i');
	await waitForText(app, 'Refine from an image of this patient');
	await type(app, path);
	await send(app, keys.enter);
}

describe('refine from an image, by keystrokes', () => {
	it('shows the still with its mask, the band levels against the plan, the changes, α0 and the cautions; a accepts, u undoes', async () => {
		const app = await open();
		await measure(app, still);
		await waitForText(app, 'o measured x unusable + plan', 20_000);
		const shown = frame(app);
		expect(shown).toContain('patient.dcm');
		expect(shown).toContain(': measured  / left out');
		expect(shown).toMatch(/\//);
		expect(shown).toMatch(/Layer 4 Liver: α0 \d\.\d\d dB\/cm\/MHz, 95 % \d\.\d\d–\d\.\d\d/);
		expect(shown).toMatch(/slider +1 +2 +3/);
		expect(shown).toMatch(/dB +[+−]\d+\.\d/);
		expect(shown).toContain('master');
		expect(shown).toContain('UNCALIBRATED');
		// The cautions, wrapped under the still.
		expect(shown).toContain('qualified operator');
		expect(shown).toContain('confirm it on the live');
		expect(shown).toContain('wrong corrections');
		await press(app, 'a');
		await waitForText(app, 'now in the plan (u undoes); confirm live.');
		expect(frame(app)).not.toContain('o measured x unusable');
		await press(app, 'u');
		await waitForText(app, 'Undid one change');
	}, 60_000);

	it('Esc discards the measurement and leaves the plan as it was', async () => {
		const app = await open();
		await measure(app, still);
		await waitForText(app, 'o measured x unusable + plan', 20_000);
		await press(app, keys.escape);
		await waitForText(app, 'Measurement discarded; the plan is unchanged.');
		await press(app, 'u');
		await waitForText(app, 'Nothing to undo.');
	}, 60_000);

	it('a file that is not an image is refused by name, and the form stays open to correct it', async () => {
		const app = await open(80, 24);
		await measure(app, notImage);
		await waitForText(app, 'Not measured:', 20_000);
		expect(frame(app)).toContain('notes.txt');
		await press(app, keys.escape);
		await waitForText(app, 'Curve');
		expect(frame(app)).not.toContain('Not measured:');
	}, 60_000);

	it('outside step 5 the key says where refining lives', async () => {
		const app = await open();
		await press(app, 'i');
		await waitForText(app, 'step 5');
	});
});

describe('refine from an image, the pure steps', () => {
	const key = (s: ConsoleState, input: string, flags: Partial<typeof noFlags> = {}) =>
		consoleReducer(s, {type: 'key', input, key: {...noFlags, ...flags}});
	const run = (s: ConsoleState): ConsoleState => {
		let next = s;
		for (const effect of s.effects) {
			next = consoleReducer(next, {type: 'effects-taken', count: 1});
			for (const action of runEffect(effect, {
				shelf: openShelf({home: join(dir, 'home2')}),
				doc: s.doc,
				exit: () => {},
			}) as Action[])
				next = consoleReducer(next, action);
		}
		return next;
	};

	it('accepting writes the measured α0 with its interval on the fitted layer, as one undoable edit', () => {
		let s = createInitialState({doc, originName: 'test', startingPoints: [], isWide: true});
		s = key(s, '5');
		s = key(s, 'i');
		expect(modeOf(s)).toBe('refine-pick');
		for (const ch of still) s = key(s, ch);
		s = run(key(s, '', {return: true}));
		expect(s.refine.phase).toBe('shown');
		expect(modeOf(s)).toBe('refine');
		const a = s.refine.phase === 'shown' ? s.refine.result.attenuation! : null;
		expect(a).not.toBeNull();
		s = key(s, 'a');
		const m = s.doc.layers[a!.layerIndex]!.measuredAlpha!;
		expect(m.alphaDbPerCmMhz).toBeCloseTo(a!.alphaDbPerCmMhz, 3);
		expect(m.lowDbPerCmMhz).toBeLessThanOrEqual(m.alphaDbPerCmMhz);
		expect(m.highDbPerCmMhz).toBeGreaterThanOrEqual(m.alphaDbPerCmMhz);
		expect(s.refine.phase).toBe('closed');
		s = key(s, 'u');
		expect(s.doc.layers[a!.layerIndex]!.measuredAlpha).toBeUndefined();
	});

	it('a settings file is read with the still: the stated settings are used; a wrong slider count is refused by name', () => {
		const withSettings = (path: string): ConsoleState => {
			let s = createInitialState({doc, originName: 'test', startingPoints: [], isWide: true});
			s = key(key(s, '5'), 'i');
			for (const ch of still) s = key(s, ch);
			s = key(key(s, '', {tab: true}), '', {tab: true});
			for (const ch of path) s = key(s, ch);
			return run(key(s, '', {return: true}));
		};
		const good = withSettings(settingsPath);
		expect(good.refine.phase === 'shown' && good.refine.result.appliedIsPlanFit).toBe(false);
		const bad = withSettings(wrongCount);
		expect(bad.refine.phase).toBe('pick');
		expect(bad.refine.phase === 'pick' ? bad.refine.error : '').toMatch(
			/three-sliders\.json: not valid settings for this plan \(sliders/,
		);
	});
});
