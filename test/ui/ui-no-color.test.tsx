/**
 * NO_COLOR: with colour forced on for this file (so a coloured frame would show escape codes),
 * the plain theme chosen under NO_COLOR writes none, and the meaning stays readable as text.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, beforeAll, describe, expect, it} from 'vitest';
import {boneAndNoisePlanJson} from '../fixtures/plans.js';

// Before Ink (and chalk) are loaded, hence the dynamic imports below.
process.env['FORCE_COLOR'] = '1';

const home = mkdtempSync(join(tmpdir(), 'evenecho-nocolor-'));
afterAll(() => rmSync(home, {recursive: true, force: true}));

const ansi = /\u001B\[/;

const boneAndNoise = structuredClone(boneAndNoisePlanJson);

let lib: {
	render: typeof import('ink-testing-library').render;
	App: typeof import('../../src/ui/app.js').App;
	openShelf: typeof import('../../src/ui/effects/preset-shelf.js').openShelf;
	theme: typeof import('../../src/ui/kit/theme.js');
	press: typeof import('../helpers/press.js');
	parse: typeof import('../../src/plan/plan-schema.js').parsePlanDocument;
};

beforeAll(async () => {
	lib = {
		render: (await import('ink-testing-library')).render,
		App: (await import('../../src/ui/app.js')).App,
		openShelf: (await import('../../src/ui/effects/preset-shelf.js')).openShelf,
		theme: await import('../../src/ui/kit/theme.js'),
		press: await import('../helpers/press.js'),
		parse: (await import('../../src/plan/plan-schema.js')).parsePlanDocument,
	};
});

function plan() {
	const r = lib.parse(boneAndNoise);
	if (!r.ok) throw new Error(r.errors.join('; '));
	return r.value;
}

describe('NO_COLOR', () => {
	it('picks the plain theme when NO_COLOR is set and the colour theme otherwise', () => {
		expect(lib.theme.themeFromEnv({NO_COLOR: '1'}).name).toBe('plain');
		expect(lib.theme.themeFromEnv({NO_COLOR: ''}).name).toBe('colour');
		expect(lib.theme.themeFromEnv({}).name).toBe('colour');
	});

	it('colour theme: the frame does carry escape codes here (the check below means something)', async () => {
		const {render, App, openShelf, theme, press} = lib;
		const app = render(<App shelf={openShelf({home})} theme={theme.colourTheme} columns={100} rows={30} />);
		await press.ready(app);
		expect(press.frame(app)).toMatch(ansi);
		app.unmount();
	});

	it('plain theme: no escape codes, and noise floor, blocked depth and warnings are in words and characters', async () => {
		const {render, App, openShelf, theme, press} = lib;
		const saved = process.env['NO_COLOR'];
		process.env['NO_COLOR'] = '1';
		const app = render(
			<App shelf={openShelf({home})} theme={theme.themeFromEnv()} initialPlan={plan()} columns={100} rows={30} />,
		);
		await press.ready(app);
		await press.press(app, '5');
		const f = press.frame(app);
		expect(f).not.toMatch(ansi);
		expect(f).toMatch(/~ Beyond \d+\.\d cm the echo/);
		expect(f).toContain('# Cortical bone from 8.0 cm');
		expect(f).toContain('# blocked');
		expect(f).toContain('~ noise');
		expect(f).toContain('> ');
		await press.press(app, '2', keys.tab);
		expect(press.frame(app)).not.toMatch(ansi);
		expect(press.frame(app)).toContain('~ below the noise floor from');
		expect(press.frame(app)).toContain('# strong reflector at 8.0 cm');
		app.unmount();
		if (saved === undefined) delete process.env['NO_COLOR'];
		else process.env['NO_COLOR'] = saved;
	});
});

const keys = {tab: '\t'};
