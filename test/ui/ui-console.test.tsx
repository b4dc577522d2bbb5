/**
 * The console driven by real keystrokes, the preset store in a temporary EVENECHO_HOME.
 * Assertions read what the screen shows.
 */
import {existsSync, mkdtempSync, readFileSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it, vi} from 'vitest';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {openPresetStore} from '../../src/store/preset-store.js';
import {cautionLine} from '../../src/report/cautions.js';
import {keys} from '../helpers/keys.js';
import {frame, moveTo, press, ready, selectedLine, send, type, waitForText, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

function tempDir(): string {
	const d = mkdtempSync(join(tmpdir(), 'evenecho-ui-'));
	dirs.push(d);
	return d;
}

async function open(
	options: {columns?: number; rows?: number; onExit?: (s: {readonly isDirty: boolean}) => void} = {},
) {
	const home = tempDir();
	const exportDir = tempDir();
	const app = render(
		<App
			shelf={openShelf({home})}
			theme={plainTheme}
			exportDir={exportDir}
			columns={options.columns ?? 100}
			rows={options.rows ?? 30}
			{...(options.onExit ? {onExit: options.onExit} : {})}
		/>,
	);
	apps.push(app);
	await ready(app);
	return {app, home, exportDir};
}

/** The lines of the frame's left pane (the step), wide layout. */
const left = (app: Rendered) =>
	frame(app)
		.split('\n')
		.map((l) => l.slice(0, 49));

describe('console: first screen', () => {
	it('opens on the demo plan with the templates listed, the live curve beside, and the caution', async () => {
		const {app} = await open();
		const f = frame(app);
		expect(f).toContain('[1 Starting plan]');
		expect(f).toContain('Built-in demo (thick-fat liver)');
		expect(f).toContain('Upper abdomen – liver');
		expect(f).toContain('template');
		expect(f).toContain('Live curve');
		expect(f).toContain('master ');
		expect(f.replace(/\s+/g, ' ')).toContain(cautionLine);
	});
});

describe('console: step 1, starting plan', () => {
	it('loads a template and moves on to the tissue stack', async () => {
		const {app} = await open();
		await moveTo(app, keys.down, 'Upper abdomen');
		await press(app, keys.enter);
		const f = frame(app);
		expect(f).toContain('[2 Tissue stack]');
		expect(f).toContain('Started from "Upper abdomen – liver"');
		expect(f).toContain('1 Skin (dermis)');
		expect(f).toContain('2 Fat (subcutaneous)');
	});

	it('asks before replacing a changed plan, and n keeps it', async () => {
		const {app} = await open();
		await press(app, '2', '+'); // fat 5 -> 5.5 cm: now changed
		expect(frame(app)).toContain('*changed');
		await press(app, '1');
		await moveTo(app, keys.down, 'Kidney');
		await press(app, keys.enter);
		expect(frame(app)).toContain('Start again from "Kidney');
		await press(app, 'n');
		expect(frame(app)).toContain('Nothing changed.');
		await press(app, '2');
		expect(frame(app)).toContain('5.5 cm');
	});
});

describe('console: step 2, tissue stack', () => {
	it('sets the measured fat thickness by typing', async () => {
		const {app} = await open();
		await press(app, '2');
		expect(selectedLine(app)).toContain('Fat, measured on screen');
		await press(app, keys.enter);
		await type(app, '7.5');
		await press(app, keys.enter);
		expect(selectedLine(app)).toContain('7.5 cm');
		expect(frame(app)).toMatch(/2 Fat \(subcutaneous\)\s+7\.5 cm/);
	});

	it('takes keys that arrive in one chunk one by one (fast typing, tmux send-keys)', async () => {
		const {app} = await open();
		await press(app, '2', '\r6.5\r');
		expect(selectedLine(app)).toContain('6.5 cm');
	});

	it('adds, reorders and removes layers, and refuses to remove the last one', async () => {
		const {app} = await open();
		await press(app, '2');
		await moveTo(app, keys.down, '1 stand-off pad');
		await press(app, 'a');
		expect(selectedLine(app)).toContain('2 Generic soft tissue');
		await press(app, 'J');
		expect(selectedLine(app)).toContain('3 Generic soft tissue');
		expect(frame(app)).toContain('2 Fat (subcutaneous)');
		await press(app, keys.shiftUp);
		expect(selectedLine(app)).toContain('2 Generic soft tissue');
		await press(app, 'x');
		expect(frame(app)).not.toMatch(/\d Generic soft tissue +\d/);
		expect(frame(app)).toContain('Removed layer 2 Generic soft tissue; u brings it back.');
		// Remove down to one layer, then once more.
		await moveTo(app, keys.up, '1 stand-off pad');
		await press(app, 'x', 'x', 'x');
		expect(frame(app)).toContain('1 Liver');
		await press(app, 'x');
		expect(frame(app)).toContain('refused: a plan needs at least one layer');
	});

	it('picks a tissue from the library, showing its values and source', async () => {
		const {app} = await open();
		await press(app, '2');
		await moveTo(app, keys.down, '3 Skeletal muscle');
		await press(app, 't');
		expect(frame(app)).toContain('Tissue for layer 3');
		expect(frame(app)).toMatch(/a0\s+n\s+c m\/s\s+rho/);
		await moveTo(app, keys.up, 'Kidney');
		expect(frame(app)).toContain('source: c: from memory');
		await press(app, keys.enter);
		expect(frame(app)).toContain('3 Kidney');
	});

	it('opens a layer, edits its thickness, and types a custom tissue with all five values', async () => {
		const {app} = await open();
		await press(app, '2');
		await moveTo(app, keys.down, '3 Skeletal muscle');
		await press(app, keys.enter);
		expect(frame(app)).toContain('layer 3 of 4');
		await moveTo(app, keys.down, 'Thickness');
		await press(app, keys.enter, '2', keys.enter);
		expect(selectedLine(app)).toContain('2 cm');
		await moveTo(app, keys.down, 'custom tissue');
		await press(app, keys.enter);
		expect(frame(app)).toContain('Name');
		await moveTo(app, keys.up, 'Name');
		await press(app, keys.enter);
		await type(app, 'Rectus sheath');
		await press(app, keys.enter);
		expect(frame(app)).toContain('Rectus sheath');
		for (const [label, value] of [
			['Speed c', '1600'],
			['Density rho', '1080'],
			['Attenuation a0', '1.1'],
			['Exponent n', '1.2'],
		] as const) {
			await moveTo(app, keys.down, label);
			await press(app, keys.enter);
			await type(app, value);
			await press(app, keys.enter);
			expect(selectedLine(app)).toContain(value);
		}
		await press(app, keys.escape);
		expect(frame(app)).toContain('3 Rectus sheath');
		expect(frame(app)).toContain('a0 1.1  n 1.2  c 1600  rho 1080');
	});
});

describe('console: step 3, probe and system', () => {
	it('nudges with + and ], switches to tissue-harmonic receive, and calibrates the noise budget from a phantom', async () => {
		const {app} = await open();
		await press(app, '3');
		expect(selectedLine(app)).toContain('3.5 MHz');
		await press(app, '+');
		expect(selectedLine(app)).toContain('4 MHz');
		await press(app, ']');
		expect(selectedLine(app)).toContain('6 MHz');
		await press(app, '-', '[');
		expect(selectedLine(app)).toContain('3.5 MHz');
		await moveTo(app, keys.down, 'Receive');
		await press(app, keys.enter);
		expect(selectedLine(app)).toContain('tissue harmonic (at 2 f0)');
		await moveTo(app, keys.down, 'Noise budget from');
		await press(app, keys.enter);
		expect(frame(app)).toContain('Phantom reach');
		expect(frame(app)).toContain('budget in use: ');
	});

	it('changing the slider count changes the slider table', async () => {
		const {app} = await open();
		await press(app, '3');
		await moveTo(app, keys.down, 'Slider count');
		await press(app, keys.enter, '1', '2', keys.enter);
		expect(selectedLine(app)).toContain('12');
		await press(app, '5');
		expect(frame(app)).toMatch(/^\s*>?\s*12\s+\d/m);
	});
});

describe('console: refusing bad values', () => {
	it('refuses an out-of-range frequency beside the field, naming the range, and keeps the old value', async () => {
		const {app} = await open();
		await press(app, '3', keys.enter);
		await type(app, '99');
		await press(app, keys.enter);
		const f = frame(app);
		expect(f).toContain('must be a number above 0 and up to 50 MHz');
		expect(f).not.toMatch(/Error|at .*\.js:\d+/);
		await press(app, keys.escape);
		expect(selectedLine(app)).toContain('3.5 MHz');
	});

	it('refuses letters, a nudge past the end of the range, and a slider low end above the high end', async () => {
		const {app} = await open();
		await press(app, '3', keys.enter, 'x');
		expect(frame(app)).toContain('numbers only');
		await press(app, keys.escape);
		await moveTo(app, keys.down, 'Bandwidth');
		for (let i = 0; i < 3; i++) await send(app, '[');
		await press(app, '[');
		expect(frame(app)).toContain('refused: must be a number from 0 to 1.5');
		await moveTo(app, keys.down, 'Slider low end');
		await press(app, keys.enter);
		await type(app, '20');
		await press(app, keys.enter);
		expect(frame(app)).toContain('must be below the slider high end (15 dB)');
	});

	it('a display shallower than a fixed target brings the target up with it (the thin-child case)', async () => {
		const {app} = await open();
		await moveTo(app, keys.down, 'Upper abdomen');
		await press(app, keys.enter, '3');
		await moveTo(app, keys.down, 'Display depth');
		await press(app, keys.enter);
		await type(app, '8');
		await press(app, keys.enter);
		expect(selectedLine(app)).toMatch(/Display depth +8 cm/);
		await press(app, keys.down, keys.down);
		expect(selectedLine(app)).toMatch(/Target depth +8 cm/);
	});
});

describe('console: step 4, usual gains', () => {
	it('switches the comparison on and shows this patient as changes from the usual settings', async () => {
		const {app} = await open();
		await press(app, '4');
		expect(frame(app)).toContain('Compare to usual');
		await press(app, keys.enter);
		expect(frame(app)).toContain('Usual master');
		expect(frame(app)).toMatch(/Usual slider 1\s+-?\d/);
		expect(frame(app)).toContain('patient ');
		await moveTo(app, keys.down, 'Usual slider 2');
		await press(app, keys.enter);
		await type(app, '40');
		await press(app, keys.enter);
		expect(frame(app)).toContain('must be within the slider range, -15 dB to 15 dB');
		await press(app, keys.escape, '5');
		expect(frame(app)).toContain('vs usual');
	});
});

describe('console: step 5, curve, save and export', () => {
	it('shows the plot with its legend, the slider table, master gain, reach and warnings', async () => {
		const {app} = await open();
		await press(app, '5');
		const f = frame(app);
		expect(f).toContain('[5 Curve & save]');
		expect(f).toContain('# depth slider   comp vs usual');
		expect(f).toContain('master ');
		expect(f).toContain('reach ');
		expect(f).toContain('* need');
		expect(f).toMatch(/^\s*>\s+1\s+1\.0/m);
		await press(app, keys.down);
		expect(f).toContain('@');
	});

	it('exports the plan JSON and the text summary into the export folder', async () => {
		const {app, exportDir} = await open();
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Wrote ');
		expect(frame(app)).toContain(
			`Wrote ${join(exportDir, 'demo-deep-liver-through-thick-fat.plan.json')} and .summary.txt`,
		);
		const json = JSON.parse(readFileSync(join(exportDir, 'demo-deep-liver-through-thick-fat.plan.json'), 'utf8'));
		expect(json.format).toBe('evenecho-plan/2');
		expect(readFileSync(join(exportDir, 'demo-deep-liver-through-thick-fat.summary.txt'), 'utf8')).toContain(
			'Cautions',
		);
	});

	it('shows every warning in full with w', async () => {
		const {app} = await open();
		await press(app, 'w');
		expect(frame(app)).toContain('Warnings in full');
		expect(frame(app)).toContain('is drawn');
		await press(app, keys.escape);
		expect(frame(app)).not.toContain('Warnings in full');
	});
});

describe('console: a whole plan by keyboard, template to saved preset', () => {
	it('invented patient "Bed 12, Ward Kestrel": 7 cm of fat over the liver, 2.5 MHz, saved and then replaced', async () => {
		const {app, home} = await open();
		await moveTo(app, keys.down, 'Upper abdomen');
		await press(app, keys.enter);
		// Step 2: measured fat.
		await press(app, keys.enter);
		await type(app, '7');
		await press(app, keys.enter);
		expect(frame(app)).toMatch(/2 Fat \(subcutaneous\)\s+7\.0 cm/);
		// Step 3: a lower frequency for the deep liver.
		await press(app, keys.right, keys.enter);
		await type(app, '2.5');
		await press(app, keys.enter);
		expect(selectedLine(app)).toContain('2.5 MHz');
		// Step 4: compare with the department's usual settings for the template.
		await press(app, keys.right, keys.enter);
		expect(frame(app)).toContain('Usual master');
		// Step 5: save.
		await press(app, keys.right);
		expect(frame(app)).toContain('vs usual');
		await moveTo(app, keys.down, 'Save as a preset');
		await press(app, keys.enter);
		expect(frame(app)).toContain('Save as preset, name: [Upper abdomen – liver_]');
		await type(app, 'Kestrel bed 12 thick fat');
		await press(app, keys.enter);
		expect(frame(app)).toContain('Saved as preset "Kestrel bed 12 thick fat"');
		expect(frame(app)).not.toContain('*changed');
		const saved = openPresetStore({home}).find('Kestrel bed 12 thick fat');
		expect(saved?.plan.layers[1]).toEqual({tissue: 'fat', thicknessCm: 7, thicknessAs: 'displayed'});
		expect(saved?.plan.probe.centerMhz).toBe(2.5);
		expect(saved?.plan.reference?.slidersDb).toHaveLength(8);

		// Saving again under the same name asks before replacing it.
		await press(app, '3', '-', 's');
		await press(app, keys.enter);
		expect(frame(app)).toContain('A preset named "Kestrel bed 12 thick fat" exists. Replace it? (y/n)');
		await press(app, 'y');
		expect(frame(app)).toContain('Saved as preset');
		expect(openPresetStore({home}).find('Kestrel bed 12 thick fat')?.plan.probe.centerMhz).toBe(2);
		// And it is now a starting point in step 1.
		await press(app, '1');
		expect(frame(app)).toContain('Kestrel bed 12 thick fat');
		expect(frame(app)).toContain('saved');
	});
});

describe('console: quitting', () => {
	it('quits at once when nothing changed', async () => {
		const onExit = vi.fn();
		const {app} = await open({onExit});
		app.stdin.write('q');
		await vi.waitFor(() => expect(onExit).toHaveBeenCalledWith({isDirty: false}), {timeout: 3000});
	});

	it('asks first with unsaved changes: n stays, y leaves', async () => {
		const onExit = vi.fn();
		const {app} = await open({onExit});
		await press(app, '2', '+', 'q');
		expect(frame(app)).toContain('not saved as a preset. Quit anyway? (y/n)');
		await press(app, 'n');
		expect(frame(app)).toContain('Still here.');
		expect(onExit).not.toHaveBeenCalled();
		await press(app, 'q');
		app.stdin.write('y');
		await vi.waitFor(() => expect(onExit).toHaveBeenCalledWith({isDirty: true}), {timeout: 3000});
	});

	it('Ctrl+C leaves even with unsaved changes', async () => {
		const onExit = vi.fn();
		const {app} = await open({onExit});
		await press(app, '2', '+');
		app.stdin.write(keys.ctrlC);
		await vi.waitFor(() => expect(onExit).toHaveBeenCalledWith({isDirty: true}), {timeout: 3000});
	});
});

describe('console: help overlay', () => {
	it('lists every key of the key table and closes with Esc', async () => {
		const {bindings} = await import('../../src/ui/state/key-intents.js');
		const {app} = await open();
		await press(app, '?');
		const f = frame(app);
		for (const b of bindings) {
			expect(f).toContain(b.keys);
			expect(f).toContain(b.help);
		}
		await press(app, keys.escape);
		expect(frame(app)).toContain('[1 Starting plan]');
	});
});

describe('console: Tab between panes', () => {
	it('wide: Tab gives the keys to the curve pane, where Up/Down pick a slider', async () => {
		const {app} = await open();
		await press(app, keys.tab);
		expect(frame(app)).toContain('> Live curve: Up/Down pick a slider');
		await press(app, keys.down);
		expect(frame(app)).toContain('slider 2 at 3.0 cm');
		await press(app, keys.tab);
		expect(frame(app)).toContain('Live curve (Tab to look closer)');
	});

	it('narrow: Tab shows the curve step and goes back', async () => {
		const {app} = await open({columns: 80, rows: 24});
		await press(app, '3', keys.tab);
		expect(frame(app)).toContain('[5 Curve & save]');
		await press(app, keys.tab);
		expect(frame(app)).toContain('[3 Probe & system]');
	});
});

describe('console: left-pane content stays in its column', () => {
	it('wide: the step rows never spill into the curve pane', async () => {
		const {app} = await open();
		await press(app, '3');
		expect(left(app).some((l) => l.includes('Centre frequency'))).toBe(true);
	});
});

describe('console: export file names', () => {
	it('are made safe from the plan name', async () => {
		const {fileStem} = await import('../../src/ui/effects/export-files.js');
		expect(fileStem('Demo – deep liver / thick fat')).toBe('demo-deep-liver-thick-fat');
		expect(fileStem('---')).toBe('plan');
		expect(existsSync('.')).toBe(true);
	});
});
