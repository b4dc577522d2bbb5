/**
 * The picture in the console: p toggles between the curve plot and the simulated picture on the
 * curve step and in the live curve pane; both panels side by side at 100 columns, one at a time at
 * 80; 24-bit, 256-colour and plain-character rendering; always labelled an illustration.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, beforeAll, describe, expect, it} from 'vitest';

// Before Ink (and chalk) load, so a coloured frame would show its escape codes.
process.env['FORCE_COLOR'] = '1';

const home = mkdtempSync(join(tmpdir(), 'evenecho-picture-'));
afterAll(() => rmSync(home, {recursive: true, force: true}));

let lib: {
	render: typeof import('ink-testing-library').render;
	App: typeof import('../../src/ui/app.js').App;
	openShelf: typeof import('../../src/ui/effects/preset-shelf.js').openShelf;
	theme: typeof import('../../src/ui/kit/theme.js');
	press: typeof import('../helpers/press.js');
	cells: typeof import('../../src/ui/picture/picture-cells.js');
};

beforeAll(async () => {
	lib = {
		render: (await import('ink-testing-library')).render,
		App: (await import('../../src/ui/app.js')).App,
		openShelf: (await import('../../src/ui/effects/preset-shelf.js')).openShelf,
		theme: await import('../../src/ui/kit/theme.js'),
		press: await import('../helpers/press.js'),
		cells: await import('../../src/ui/picture/picture-cells.js'),
	};
}, 60_000);

const illustration = 'Illustration: a uniform tissue';
const halfBlock = '\u2580';
const ansi = /\u001B\[/;

async function open(columns: number, rows: number, plain = false) {
	const {render, App, openShelf, theme, press} = lib;
	const app = render(
		<App
			shelf={openShelf({home})}
			theme={plain ? theme.plainTheme : theme.colourTheme}
			columns={columns}
			rows={rows}
		/>,
	);
	await press.ready(app);
	return app;
}

describe('picture modes from the environment', () => {
	it('NO_COLOR, TERM=dumb and a non-UTF-8 locale give plain characters; COLORTERM truecolor 24-bit; else 256 colours', () => {
		const {pictureModeFromEnv} = lib.cells;
		expect(pictureModeFromEnv({NO_COLOR: '1', COLORTERM: 'truecolor', LANG: 'C.UTF-8'})).toBe('plain');
		expect(pictureModeFromEnv({TERM: 'dumb', COLORTERM: 'truecolor'})).toBe('plain');
		expect(pictureModeFromEnv({LANG: 'C', COLORTERM: 'truecolor'})).toBe('plain');
		expect(pictureModeFromEnv({LANG: 'en_GB.UTF-8', COLORTERM: 'truecolor'})).toBe('truecolor');
		expect(pictureModeFromEnv({LANG: 'en_GB.UTF-8', TERM: 'xterm-256color'})).toBe('256');
	});

	it('cells: 24-bit and 256-colour half blocks (index 232 + round((v − 8)/10)), plain shading characters', () => {
		const {pictureLines, greyRampIndex} = lib.cells;
		const grey = Uint8Array.from([0, 128, 255, 255, 0, 128]);
		expect([greyRampIndex(0), greyRampIndex(128), greyRampIndex(255)]).toEqual([232, 244, 255]);
		const truecolour = pictureLines(grey, 3, 2, 'truecolor')[0]!;
		expect(truecolour).toContain('\u001B[38;2;128;128;128m\u001B[48;2;0;0;0m' + halfBlock);
		expect(pictureLines(grey, 3, 2, '256')[0]).toContain('\u001B[38;5;244m');
		// Cell means 127.5, 64 and 191.5 → shades 4, 2 and 7 of ten.
		expect(pictureLines(grey, 3, 2, 'plain')).toEqual(['=:#']);
	});
});

describe('the picture in the console', () => {
	it('at 100 columns: p on the curve step shows both panels with the label, p again the plot', async () => {
		const {press} = lib;
		const app = await open(100, 30);
		await press.press(app, '5', 'p');
		let f = press.frame(app);
		expect(f).toContain('built-in ramp only');
		expect(f).toContain('this plan');
		expect(f).toContain(illustration);
		expect(f).toContain(halfBlock);
		expect(f).toMatch(/<1/);
		await press.press(app, 'p');
		f = press.frame(app);
		expect(f).not.toContain(illustration);
		app.unmount();
	});

	it('the picture stays on while the plan changes, and follows it', async () => {
		const {press} = lib;
		const app = await open(100, 30);
		await press.press(app, 'p', '2');
		const before = press.frame(app);
		expect(before).toContain(illustration);
		await press.press(app, 'j', '+');
		expect(press.frame(app)).toContain(illustration);
		expect(press.frame(app)).not.toBe(before);
		app.unmount();
	});

	it('at 80×24: one panel at a time on the curve step — this plan, then the ramp alone, then the plot', async () => {
		const {press} = lib;
		const app = await open(80, 24);
		await press.press(app, '5', 'p');
		expect(press.frame(app)).toContain('this plan');
		expect(press.frame(app)).not.toContain('built-in ramp only');
		expect(press.frame(app)).toContain('Illustration');
		await press.press(app, 'p');
		expect(press.frame(app)).toContain('built-in ramp only');
		await press.press(app, 'p');
		expect(press.frame(app)).not.toContain('Illustration');
		expect(press.frame(app).split('\n').length).toBeLessThanOrEqual(24);
		app.unmount();
	});

	it('NO_COLOR (plain theme): shading characters, no escape codes, marks still there', async () => {
		const {press} = lib;
		const app = await open(100, 30, true);
		await press.press(app, '5', 'p');
		const f = press.frame(app);
		expect(f).not.toMatch(ansi);
		expect(f).not.toContain(halfBlock);
		expect(f).toContain(illustration);
		expect(f).toMatch(/[.:\-=+*#%@]{5}/);
		app.unmount();
	});
});
