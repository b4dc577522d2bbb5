/**
 * The store against hostile surroundings: links and special files where its files and folders
 * should be, a save racing a rename or a delete (made deterministic with the store's pause points),
 * an import killed half way, and text that could not be loaded back.
 */
import {execFileSync, spawn} from 'node:child_process';
import {
	chmodSync,
	lstatSync,
	mkdirSync,
	readdirSync,
	readFileSync,
	statSync,
	symlinkSync,
	writeFileSync,
} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {writeFileAtomic} from '../../src/files/atomic-write.js';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {encodeBundle} from '../../src/store/preset-bundle.js';
import {encodeRecord} from '../../src/store/preset-record.js';
import {openPresetStore} from '../../src/store/preset-store.js';
import {PresetImportError, PresetStoreError} from '../../src/store/store-errors.js';
import {spawnCli} from '../helpers/spawn-cli.js';
import {assertBuilt, cleanTempHomes, repoRoot, runCli, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

const rawControl = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/u;

describe('links and special files in the store', () => {
	it('a presets folder that is a symbolic link is not followed: nothing is read or written there', () => {
		const home = tempHome();
		const elsewhere = tempHome();
		writeFileSync(join(elsewhere, 'planted.json'), encodeRecord('Planted', demoPlan()));
		symlinkSync(elsewhere, join(home, 'presets'));
		const store = openPresetStore({home});
		expect(store.notices.join()).toMatch(/presets is a symbolic link, not a real folder/);
		expect(store.list().presets.every((p) => p.isTemplate)).toBe(true);
		expect(() => store.save('Mine', demoPlan())).toThrow(PresetStoreError);
		expect(readdirSync(elsewhere)).toEqual(['planted.json']);
	});

	it('a settings file that is a link is not written through; the linked file stays as it was', () => {
		const home = tempHome();
		const victim = join(tempHome(), 'victim.json');
		writeFileSync(victim, '{"mine": true}\n');
		symlinkSync(victim, join(home, 'config.json'));
		const store = openPresetStore({home});
		expect(store.notices.join()).toMatch(/settings file: .*symbolic link/);
		store.save('Still works', demoPlan());
		expect(readFileSync(victim, 'utf8')).toBe('{"mine": true}\n');
		expect(lstatSync(join(home, 'config.json')).isSymbolicLink()).toBe(true);
	});

	it('the settings file keeps its permissions when rewritten (not widened)', () => {
		const home = tempHome();
		writeFileSync(join(home, 'config.json'), '{"layout": "old"}\n');
		chmodSync(join(home, 'config.json'), 0o600);
		openPresetStore({home});
		expect(JSON.parse(readFileSync(join(home, 'config.json'), 'utf8'))).toMatchObject({layout: 'one-file-per-preset'});
		expect(statSync(join(home, 'config.json')).mode & 0o777).toBe(0o600);
	});

	it('a FIFO among the presets is reported, never opened: listing returns at once, SIGTERM not needed', async () => {
		const home = tempHome();
		openPresetStore({home}).save('Real', demoPlan());
		execFileSync('mkfifo', [join(home, 'presets', 'pipe.json')]);
		const r = await spawnCli(['presets', 'list'], {env: {EVENECHO_HOME: home}, timeoutMs: 15_000}).ended;
		expect(r.timedOut).toBe(false);
		expect(r.code).toBe(0);
		expect(r.stdout).toContain('user:real');
		expect(r.stderr).toContain('is a named pipe (FIFO), not a regular file');
		expect(lstatSync(join(home, 'presets', 'pipe.json')).isFIFO()).toBe(true);
	});

	it('presets export --force refuses to replace a FIFO, a link or a device; they stay as they were', () => {
		assertBuilt();
		const home = tempHome();
		const out = tempHome();
		const victim = join(tempHome(), 'victim.txt');
		writeFileSync(victim, 'keep');
		execFileSync('mkfifo', [join(out, 'bundle.json')]);
		symlinkSync(victim, join(out, 'linked.json'));
		for (const [target, kind] of [
			[join(out, 'bundle.json'), 'a named pipe (FIFO)'],
			[join(out, 'linked.json'), 'a symbolic link'],
			['/dev/null', 'a character device'],
		] as const) {
			const r = runCli(['presets', 'export', '--force', target, 'breast'], home);
			expect(r.status).toBe(2);
			expect(r.stderr).toContain(`is ${kind}, not a regular file; refusing to replace it`);
			expect(r.stderr).not.toContain('exported');
		}
		expect(lstatSync(join(out, 'bundle.json')).isFIFO()).toBe(true);
		expect(readFileSync(victim, 'utf8')).toBe('keep');
		expect(lstatSync('/dev/null').isCharacterDevice()).toBe(true);
	});
});

describe('a save racing a rename or a delete is never lost', () => {
	it('rename: a save of the old name landing between the read and the removal is kept', () => {
		const home = tempHome();
		openPresetStore({home}).save('Liver thin', demoPlan());
		const rival = openPresetStore({home});
		const store = openPresetStore({
			home,
			pauseAt: {
				guarded: (point) => {
					// Another process saves the old name again, exactly inside the window.
					if (point === 'before-take')
						rival.save('Liver thin', {...demoPlan(), note: 'saved meanwhile'}, {overwrite: true});
				},
			},
		});
		const renamed = store.rename('Liver thin', 'Liver thick');
		expect(renamed.id).toBe('user:liver-thick');
		const after = openPresetStore({home});
		expect(after.get('user:liver-thin').plan.note).toBe('saved meanwhile');
		expect(after.get('user:liver-thick').name).toBe('Liver thick');
		expect(store.notices.join()).toMatch(/saved again by another process while it was being renamed/);
		expect(readdirSync(after.presetsDir).sort()).toEqual(['liver-thick.json', 'liver-thin.json']);
	});

	it('rename within the same file (case only): a save in the window wins and the rename is refused', () => {
		const home = tempHome();
		openPresetStore({home}).save('Liver thin', demoPlan());
		const rival = openPresetStore({home});
		const store = openPresetStore({
			home,
			pauseAt: {
				guarded: (point) =>
					point === 'before-take' &&
					void rival.save('Liver thin', {...demoPlan(), note: 'saved meanwhile'}, {overwrite: true}),
			},
		});
		expect(() => store.rename('Liver thin', 'LIVER THIN')).toThrow(
			/changed by another process after it was read; nothing was renamed/,
		);
		expect(openPresetStore({home}).get('user:liver-thin').plan.note).toBe('saved meanwhile');
	});

	it('delete: a save landing in the window is kept and the delete refused', () => {
		const home = tempHome();
		openPresetStore({home}).save('Kidney', demoPlan());
		const rival = openPresetStore({home});
		const store = openPresetStore({
			home,
			pauseAt: {
				guarded: (point) =>
					point === 'before-take' && void rival.save('Kidney', {...demoPlan(), note: 'newer'}, {overwrite: true}),
			},
		});
		expect(() => store.remove('Kidney')).toThrow(
			/saved again by another process after it was read; nothing was deleted/,
		);
		expect(openPresetStore({home}).get('Kidney').plan.note).toBe('newer');
	});
});

describe('an import killed half way', () => {
	function killedImport(home: string, bundle: string, after: number): Promise<NodeJS.Signals | null> {
		return new Promise((resolve, reject) => {
			const child = spawn(
				process.execPath,
				[join(repoRoot, 'test', 'fixtures', 'presets', 'killed-import.mjs'), home, bundle, String(after)],
				{stdio: 'ignore', timeout: 20_000},
			);
			child.on('error', reject);
			child.on('exit', (_code, signal) => resolve(signal));
		});
	}

	it('is rolled back when the store next opens (replaced presets back, no temporary files); the retry succeeds', async () => {
		assertBuilt();
		const home = tempHome();
		openPresetStore({home}).save('Alpha', {...demoPlan(), note: 'the original'});
		const bundle = join(tempHome(), 'bundle.json');
		const names = ['Alpha', 'Beta', 'Gamma'];
		writeFileSync(bundle, encodeBundle(names.map((name) => ({name, plan: {...demoPlan(), name, note: 'imported'}}))));
		expect(await killedImport(home, bundle, 1)).toBe('SIGKILL');

		const listed = runCli(['presets', 'list'], home);
		expect(listed.status).toBe(0);
		expect(listed.stderr).toMatch(/an earlier import of 3 files was interrupted; it was rolled back/);
		expect(listed.stdout).not.toContain('user:beta');
		expect(readdirSync(join(home, 'presets'))).toEqual(['alpha.json']);
		expect(openPresetStore({home}).get('Alpha').plan.note).toBe('the original');

		const retry = runCli(['presets', 'import', '--force', bundle], home);
		expect(retry.status).toBe(0);
		expect(readdirSync(join(home, 'presets')).sort()).toEqual(['alpha.json', 'beta.json', 'gamma.json']);
		expect(openPresetStore({home}).get('Alpha').plan.note).toBe('imported');
	});
});

describe('what is saved can be loaded back', () => {
	it('a plan with control characters in a text field is refused by save, as by import and listing', () => {
		const store = openPresetStore({home: tempHome()});
		expect(() => store.save('Noted', {...demoPlan(), note: 'fine\u001b[2Jnot'})).toThrow(PresetImportError);
		expect(() => store.save('Regional', {...demoPlan(), region: 'abdomen\u0007'})).toThrow(PresetImportError);
		expect(store.list().presets.every((p) => p.isTemplate)).toBe(true);
	});

	it('a hand-edited preset with escapes, or one with a raw escape in a damaged file, is reported printably', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		store.save('Good', demoPlan());
		writeFileAtomic(
			join(store.presetsDir, 'edited.json'),
			encodeRecord('Edited', demoPlan()).replace('"region": "', '"region": "\\u001b]0;owned\\u0007'),
			{replace: false},
		);
		writeFileSync(join(store.presetsDir, 'broken.json'), '{"name": "\u001b[2J');
		mkdirSync(join(store.presetsDir, 'sub.json'));
		const r = runCli(['presets', 'list'], home);
		expect(r.status).toBe(0);
		expect(rawControl.test(r.stdout + r.stderr)).toBe(false);
		expect(r.stderr).toContain('user preset user:edited');
		expect(r.stderr).toContain('region: contains a control');
		expect(r.stderr).toMatch(/broken\.json was damaged/);
		expect(r.stderr).toContain('is a folder, not a regular file');
	});
});
