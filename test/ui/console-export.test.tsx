/**
 * Keystroke tests for exporting the plan: the folder is asked (the current one offered), files
 * already there are replaced only after a yes, the full path written is said, and a link or a
 * special file under the name is refused with nothing written. Behaviour of the file layer's
 * rules (atomic, all or nothing, regular files only); no physics is asserted.
 */
import {
	lstatSync,
	mkdirSync,
	mkdtempSync,
	readFileSync,
	readlinkSync,
	rmSync,
	symlinkSync,
	writeFileSync,
} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {render} from 'ink-testing-library';
import {afterEach, describe, expect, it} from 'vitest';
import {App} from '../../src/ui/app.js';
import {openShelf} from '../../src/ui/effects/preset-shelf.js';
import {plainTheme} from '../../src/ui/kit/theme.js';
import {keys} from '../helpers/keys.js';
import {frame, press, ready, type, waitForText, type Rendered} from '../helpers/press.js';

const dirs: string[] = [];
const apps: Rendered[] = [];
afterEach(() => {
	for (const a of apps.splice(0)) a.unmount();
	for (const d of dirs.splice(0)) rmSync(d, {recursive: true, force: true});
});

const stem = 'demo-deep-liver-through-thick-fat';

async function open(exportDir: string) {
	const home = mkdtempSync(join(tmpdir(), 'evenecho-export-home-'));
	dirs.push(home);
	const app = render(
		<App shelf={openShelf({home})} theme={plainTheme} exportDir={exportDir} columns={120} rows={30} />,
	);
	apps.push(app);
	await ready(app);
	return app;
}

describe('export asks where, and before replacing', () => {
	it('offers the current folder, writes where typed, and says the full path', async () => {
		const base = mkdtempSync(join(tmpdir(), 'evenecho-export-'));
		dirs.push(base);
		mkdirSync(join(base, 'protocols'));
		const app = await open(base);
		await press(app, 'e');
		expect(frame(app)).toContain(`Export to folder: [${base}_]`);
		await type(app, join(base, 'protocols'));
		await press(app, keys.enter);
		await waitForText(app, 'Wrote ');
		expect(frame(app)).toContain(`Wrote ${join(base, 'protocols', `${stem}.plan.json`)} and .summary.txt`);
		expect(JSON.parse(readFileSync(join(base, 'protocols', `${stem}.plan.json`), 'utf8')).format).toBe(
			'evenecho-plan/2',
		);
	});

	it('asks before replacing; n leaves the files, y replaces them', async () => {
		const base = mkdtempSync(join(tmpdir(), 'evenecho-export-'));
		dirs.push(base);
		writeFileSync(join(base, `${stem}.plan.json`), 'older');
		writeFileSync(join(base, `${stem}.summary.txt`), 'older');
		const app = await open(base);
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Replace the 2 files already there? (y/n)');
		await press(app, 'n');
		expect(readFileSync(join(base, `${stem}.plan.json`), 'utf8')).toBe('older');
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Replace the 2 files');
		await press(app, 'y');
		await waitForText(app, 'Wrote ');
		expect(readFileSync(join(base, `${stem}.plan.json`), 'utf8')).toContain('evenecho-plan/2');
		expect(readFileSync(join(base, `${stem}.summary.txt`), 'utf8')).toContain('Cautions');
	});

	it('refuses a link under the name, writes nothing, and refuses a folder that is not there', async () => {
		const base = mkdtempSync(join(tmpdir(), 'evenecho-export-'));
		dirs.push(base);
		writeFileSync(join(base, 'elsewhere.txt'), 'keep');
		symlinkSync(join(base, 'elsewhere.txt'), join(base, `${stem}.plan.json`));
		const app = await open(base);
		await press(app, 'e', keys.enter);
		await waitForText(app, 'Replace the file already there?');
		await press(app, 'y');
		await waitForText(app, 'nothing written');
		expect(lstatSync(join(base, `${stem}.plan.json`)).isSymbolicLink()).toBe(true);
		expect(readlinkSync(join(base, `${stem}.plan.json`))).toBe(join(base, 'elsewhere.txt'));
		expect(readFileSync(join(base, 'elsewhere.txt'), 'utf8')).toBe('keep');
		expect(() => lstatSync(join(base, `${stem}.summary.txt`))).toThrow();
		await press(app, 'e');
		await type(app, join(base, 'missing'));
		await press(app, keys.enter);
		await waitForText(app, 'does not exist');
	});
});
