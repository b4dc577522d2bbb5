/**
 * Keystroke tests for typing in the console: the tissue picker narrows as you type, and every text
 * field edits the same way (the shown text is replaced by the first typed character, Backspace keeps
 * it and edits it from the end). Interface behaviour only; the tissue names are the library's own.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {eraseIn, openEntry, typeInto} from '../../src/ui/state/text-entry.js';
import {keys} from '../helpers/keys.js';
import {frame, moveTo, press, ready, selectedLine, send, type, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

async function open(columns = 100, rows = 30) {
	const home = mkdtempSync(join(tmpdir(), 'evenecho-typing-'));
	dirs.push(home);
	const app = render(
		<App shelf={openShelf({home})} theme={plainTheme} exportDir={home} columns={columns} rows={rows} />,
	);
	apps.push(app);
	await ready(app);
	return app;
}

const listed = (app: Rendered) =>
	frame(app)
		.split('\n')
		.filter((l) => /^[> ] \S.* +\d+(\.\d+)? +\d+(\.\d+)? +\d+ +\d+$/.test(l));

describe('tissue picker', () => {
	it('narrows the list as letters are typed (j and k included), Backspace widens it, Enter picks the row', async () => {
		const app = await open(80, 24);
		await press(app, '2');
		await moveTo(app, keys.down, '4 Liver');
		await press(app, 't');
		expect(frame(app)).toContain('Type part of a name to narrow the list');
		const all = listed(app).length;
		await type(app, 'sk');
		expect(frame(app)).toContain('Filter: [sk_]');
		const narrowed = listed(app).map((l) => l.slice(2, 17).trim());
		expect(narrowed).toEqual(['Skin (dermis)', 'Skeletal muscle', 'Skeletal muscle']);
		expect(narrowed.length).toBeLessThan(all);
		await type(app, 'x');
		expect(frame(app)).toContain('no tissue has these words');
		expect(listed(app)).toHaveLength(0);
		await press(app, keys.backspace, keys.backspace);
		expect(frame(app)).toContain('Filter: [s_]');
		await type(app, 'k alo');
		expect(listed(app)).toHaveLength(1);
		expect(selectedLine(app)).toContain('Skeletal muscle (along');
		await press(app, keys.enter);
		expect(frame(app)).toMatch(/4 Sk(eletal|\.) muscle, along/);
	});

	it('the arrows still move in a filtered list, and the custom row stays last', async () => {
		const app = await open(100, 30);
		await press(app, '2');
		await moveTo(app, keys.down, '4 Liver');
		await press(app, 't');
		await type(app, 'liver');
		expect(listed(app).map((l) => l.slice(2, 26).trim())).toEqual(['Liver', 'Liver, steatotic (fatty)']);
		await press(app, keys.down, keys.down);
		expect(selectedLine(app)).toContain('Custom values');
		await send(app, keys.down);
		expect(selectedLine(app)).toContain('Custom values');
	});
});

describe('one way of typing into a field', () => {
	it('the shared entry: fresh text is replaced by typing and kept by Backspace', () => {
		expect(typeInto(openEntry('5'), '7', 10)).toEqual({text: '7', isFresh: false});
		expect(eraseIn(openEntry('5.5'))).toEqual({text: '5.', isFresh: false});
		expect(typeInto(eraseIn(openEntry('abc')), 'z', 10).text).toBe('abz');
		expect(typeInto({text: 'abc', isFresh: false}, 'defgh', 5).text).toBe('abcde');
	});

	it('the save name, a number and the sweep list all replace on the first key and keep on Backspace', async () => {
		const app = await open(120, 30);
		// Save name: opens on the plan's name.
		await press(app, 's');
		expect(frame(app)).toContain('typing replaces, Backspace edits');
		await press(app, keys.backspace);
		expect(frame(app)).toMatch(/name: \[Demo – deep liver through thick fa_\]/);
		await type(app, 't');
		expect(frame(app)).toMatch(/name: \[Demo – deep liver through thick fat_\]/);
		await press(app, keys.escape);
		await press(app, 's');
		await type(app, 'Bed 4');
		expect(frame(app)).toContain('name: [Bed 4_]');
		await press(app, keys.escape);
		// A number: the fat thickness on step 2.
		await press(app, '2', keys.enter);
		expect(frame(app)).toContain('Typing replaces, Backspace edits');
		await type(app, '8');
		expect(selectedLine(app)).toContain('[8_]');
		await press(app, keys.escape, keys.enter, keys.backspace);
		expect(selectedLine(app)).toContain('[_]');
		await type(app, '6');
		expect(selectedLine(app)).toContain('[6_]');
		await press(app, keys.escape);
		// The sweep list on step 5.
		await press(app, 'f', keys.enter);
		expect(frame(app)).toContain('Thickness list: typing replaces, Backspace edits');
		await type(app, '2');
		expect(frame(app)).toContain('Thicknesses, cm: [2_]');
		await press(app, keys.escape, keys.enter, keys.backspace);
		expect(frame(app)).toContain('Thicknesses, cm: [1,2,3,4,5,6,_]');
		await type(app, '9');
		expect(frame(app)).toContain('Thicknesses, cm: [1,2,3,4,5,6,9_]');
	});
});
