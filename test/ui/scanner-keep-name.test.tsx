/**
 * Keeping a measured scanner profile under a name the user types (the scanner panel's s): the
 * field opens on the session's label, edits like every other text field in the console (typing
 * replaces the marked text, Backspace edits it), Esc leaves the measurement as it was, a name that
 * is taken is refused with the way to replace it, and S keeps it over the old one. Keys are
 * written as a terminal sends them; every wait is for a condition on the frame or the store.
 */
import {mkdtempSync, rmSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, beforeAll, describe, expect, it} from 'vitest';
import {writeSession} from '../helpers/phantom-session.js';
import {keys} from '../helpers/keys.js';
import {loadScannerConsole, openScannerConsole, type ScannerConsole} from '../helpers/scanner-console.js';

const root = mkdtempSync(join(tmpdir(), 'evenecho-scanner-keep-'));
afterAll(() => rmSync(root, {recursive: true, force: true}));

let lib: ScannerConsole;
let sessionPath = '';

beforeAll(async () => {
	lib = await loadScannerConsole();
	sessionPath = writeSession(join(root, 'series'), 'png', {seed: 3, width: 200, height: 200}).sessionPath;
}, 60_000);

describe('keeping a measured scanner under a typed name', () => {
	it('offers the session label, takes a typed name, refuses a taken one and replaces with S', async () => {
		const {store} = lib;
		const {press, frame, type, send, waitForText} = lib.press;
		const home = mkdtempSync(join(root, 'home-'));
		const profiles = () => store.openScannerProfileStore(home).list().profiles;
		const app = await openScannerConsole(lib, home);
		await press(app, 'g');
		await waitForText(app, 'No profiles yet');
		await press(app, 'c');
		await type(app, sessionPath);
		await press(app, keys.enter);
		await waitForText(app, '1/4: images and measured region', 60_000);

		// The field opens on the session's label; Esc leaves the measurement untouched.
		await press(app, 's');
		expect(frame(app)).toContain('keep as: Cart B, curved array, abdomen (simulated)_');
		await press(app, keys.escape);
		expect(frame(app), frame(app)).toContain('1/4: images and measured region');
		expect(frame(app)).not.toContain('keep as:');
		expect(profiles()).toEqual([]);

		// Typing replaces the offered text; Backspace edits; the name is kept and named in the plan.
		await press(app, 's');
		await type(app, 'Ward 3 cartx');
		await press(app, keys.backspace);
		expect(frame(app)).toContain('keep as: Ward 3 cart_');
		await press(app, keys.enter);
		await waitForText(app, 'Kept the scanner profile "ward-3-cart"');
		expect(profiles().map((p) => [p.id, p.name])).toEqual([['ward-3-cart', 'Ward 3 cart']]);
		expect(frame(app)).toContain('"scanner": "ward-3-cart"');

		// Measure again and keep under the same name: refused with the way to replace it, nothing changed.
		await press(app, 'c');
		await type(app, sessionPath);
		await press(app, keys.enter);
		await waitForText(app, '1/4: images and measured region', 60_000);
		await press(app, 's');
		await type(app, 'Ward 3 cart');
		await press(app, keys.enter);
		await waitForText(app, 'S replaces it');
		expect(profiles()).toHaveLength(1);

		// S offers the last typed name and replaces the stored one.
		await press(app, 'S');
		expect(frame(app)).toContain('keep as: Ward 3 cart_');
		expect(frame(app)).toContain('replacing one of that name');
		// Backspace on the fresh text edits it rather than clearing it.
		await send(app, keys.backspace);
		await type(app, 't');
		await press(app, keys.enter);
		await waitForText(app, 'Kept the scanner profile "ward-3-cart"');
		expect(profiles()).toHaveLength(1);
		app.unmount();
	}, 180_000);
});
