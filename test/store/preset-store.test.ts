/**
 * Every store operation on a fresh temporary store: list, find/get, save, rename, copy, remove,
 * export and import, and where the store lives.
 */
import {existsSync, readdirSync, readFileSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {afterEach, describe, expect, it, vi} from 'vitest';
import {UsageError} from '../../src/errors/usage-error.js';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {openPresetStore} from '../../src/store/preset-store.js';
import {
	PresetExistsError,
	PresetImportError,
	PresetInvalidError,
	PresetNameError,
	PresetNotFoundError,
	TemplateReadOnlyError,
} from '../../src/store/store-errors.js';
import {cleanTempHomes, snapshotDir, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();
afterEach(() => {
	vi.unstubAllEnvs();
});

const plan = () => demoPlan();

describe('where the store lives', () => {
	it('uses EVENECHO_HOME when no home is given', () => {
		const home = tempHome();
		vi.stubEnv('EVENECHO_HOME', home);
		const store = openPresetStore();
		expect(store.home).toBe(home);
		store.save('Env preset', plan());
		expect(existsSync(join(home, 'presets', 'env-preset.json'))).toBe(true);
		expect(existsSync(join(home, 'config.json'))).toBe(true);
	});

	it("otherwise uses conf's standard per-user config folder (XDG_CONFIG_HOME on Linux)", () => {
		const xdg = tempHome();
		vi.stubEnv('EVENECHO_HOME', '');
		vi.stubEnv('XDG_CONFIG_HOME', xdg);
		const store = openPresetStore();
		expect(store.home.startsWith(join(xdg, 'evenecho'))).toBe(true);
		expect(store.notices).toEqual([]);
	});

	it('records its layout and record version in the settings file', () => {
		const home = tempHome();
		openPresetStore({home});
		expect(JSON.parse(readFileSync(join(home, 'config.json'), 'utf8'))).toEqual({
			layout: 'one-file-per-preset',
			recordVersion: 2,
		});
	});

	it('a store folder that cannot be used still lists the templates and refuses writes clearly', () => {
		const blocker = join(tempHome(), 'a-file');
		writeFileSync(blocker, 'not a folder');
		const store = openPresetStore({home: join(blocker, 'store')});
		expect(store.notices.join()).toMatch(/cannot be opened.*only the templates are available/);
		expect(store.list().presets.length).toBeGreaterThanOrEqual(7);
		expect(() => store.save('Anything', plan())).toThrow(UsageError);
	});
});

describe('save, find and list', () => {
	it('starts with templates only', () => {
		const {presets, problems} = openPresetStore({home: tempHome()}).list();
		expect(problems).toEqual([]);
		expect(presets.every((p) => p.isTemplate)).toBe(true);
	});

	it('saves a preset under user:<slug> and finds it by id and by name in any case or spacing', () => {
		const store = openPresetStore({home: tempHome()});
		const saved = store.save('  Bed 7 – deep liver ', plan());
		expect(saved).toMatchObject({
			id: 'user:bed-7-deep-liver',
			name: 'Bed 7 – deep liver',
			isTemplate: false,
			region: 'upper-abdomen',
		});
		expect(saved.plan.name).toBe('Bed 7 – deep liver');
		for (const q of ['user:bed-7-deep-liver', 'Bed 7 – deep liver', 'BED 7 - DEEP LIVER', 'bed-7-deep-liver'])
			expect(store.find(q)?.id).toBe(saved.id);
		expect(store.find('no such preset')).toBeUndefined();
		expect(() => store.get('no such preset')).toThrow(PresetNotFoundError);
		const listed = store.list().presets.filter((p) => !p.isTemplate);
		expect(listed).toEqual([
			{id: 'user:bed-7-deep-liver', name: 'Bed 7 – deep liver', region: 'upper-abdomen', isTemplate: false},
		]);
	});

	it('stores the plan with its defaults filled in and the record version', () => {
		const store = openPresetStore({home: tempHome()});
		const saved = store.save('Stored form', plan());
		const record = JSON.parse(readFileSync(saved.file, 'utf8')) as Record<string, unknown>;
		expect(record).toMatchObject({record: 'evenecho-preset', version: 2, name: 'Stored form'});
		expect(record['plan']).toEqual({...plan(), name: 'Stored form'});
		expect(typeof record['savedAt']).toBe('string');
	});

	it('refuses to overwrite unless asked, and the refused save changes nothing', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		store.save('Twice', plan());
		const before = snapshotDir(home);
		const other = {...plan(), note: 'changed'};
		expect(() => store.save('twice', other)).toThrow(PresetExistsError);
		expect(snapshotDir(home)).toEqual(before);
		const replaced = store.save('twice', other, {overwrite: true});
		expect(replaced.id).toBe('user:twice');
		expect(store.get('user:twice').plan.note).toBe('changed');
	});

	it('PresetExistsError names the existing preset and is a UsageError (exit 2)', () => {
		const store = openPresetStore({home: tempHome()});
		store.save('Taken', plan());
		try {
			store.save('TAKEN', plan());
			expect.unreachable();
		} catch (error) {
			expect(error).toBeInstanceOf(UsageError);
			expect(error).toMatchObject({existingId: 'user:taken', existingName: 'Taken'});
			expect((error as Error).message).toMatch(/already exists \(user:taken\); use --force/);
		}
	});

	it('refuses unsafe names and plans that do not validate, saving nothing', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		const before = snapshotDir(home);
		for (const bad of [
			'',
			' ',
			'../../etc/passwd',
			'a/b',
			'.hidden',
			'x'.repeat(61),
			'tab\tname',
			'CON',
			'semi;colon',
		]) {
			expect(() => store.save(bad, plan()), bad).toThrow(PresetNameError);
		}
		expect(() => store.save('Bad plan', {...plan(), layers: []})).toThrow(PresetImportError);
		// A name with a control character is refused with the character shown escaped.
		expect(() => store.save('esc\u001b[2J', plan())).toThrow(/"esc\\u001b\[2J" contains characters/);
		expect(snapshotDir(home)).toEqual(before);
	});
});

describe('rename, copy, remove', () => {
	it('renames: new id, old file gone, plan kept', () => {
		const store = openPresetStore({home: tempHome()});
		const saved = store.save('Old name', plan());
		const renamed = store.rename('old name', 'New name');
		expect(renamed.id).toBe('user:new-name');
		expect(renamed.plan.name).toBe('New name');
		expect(existsSync(saved.file)).toBe(false);
		expect(store.find('Old name')).toBeUndefined();
		expect(store.get('New name').plan.layers).toEqual(plan().layers);
	});

	it('renames to a different spelling of the same name in place', () => {
		const store = openPresetStore({home: tempHome()});
		store.save('liver one', plan());
		expect(store.rename('liver one', 'Liver One').id).toBe('user:liver-one');
		expect(store.get('user:liver-one').name).toBe('Liver One');
		expect(readdirSync(store.presetsDir)).toEqual(['liver-one.json']);
	});

	it('refuses to rename onto an existing preset unless asked', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		store.save('A', plan());
		store.save('B', {...plan(), note: 'b'});
		const before = snapshotDir(home);
		expect(() => store.rename('A', 'B')).toThrow(PresetExistsError);
		expect(snapshotDir(home)).toEqual(before);
		store.rename('A', 'B', {overwrite: true});
		expect(
			store
				.list()
				.presets.filter((p) => !p.isTemplate)
				.map((p) => p.id),
		).toEqual(['user:b']);
		expect(store.get('B').plan.note).toBe(plan().note);
	});

	it('copies a template or a user preset to a new user preset', () => {
		const store = openPresetStore({home: tempHome()});
		const fromTemplate = store.copy('kidney', 'My kidney');
		expect(fromTemplate).toMatchObject({id: 'user:my-kidney', isTemplate: false, region: 'kidney'});
		const again = store.copy('My kidney', 'My kidney 2');
		expect(again.plan.layers).toEqual(fromTemplate.plan.layers);
		expect(() => store.copy('kidney', 'my KIDNEY')).toThrow(PresetExistsError);
	});

	it('removes user presets, not templates', () => {
		const store = openPresetStore({home: tempHome()});
		store.save('Short lived', plan());
		expect(store.remove('short lived')).toMatchObject({id: 'user:short-lived', name: 'Short lived'});
		expect(store.find('Short lived')).toBeUndefined();
		expect(() => store.remove('Short lived')).toThrow(PresetNotFoundError);
		expect(() => store.remove('breast')).toThrow(TemplateReadOnlyError);
	});
});

describe('presets that no longer validate', () => {
	function storeWithStale() {
		const home = tempHome();
		const store = openPresetStore({home});
		const good = store.save('Still good', plan());
		const record = JSON.parse(readFileSync(good.file, 'utf8')) as {
			name: string;
			plan: {layers: Array<{tissue: unknown}>};
		};
		record.name = 'Gone tissue';
		record.plan.layers[1]!.tissue = 'tissue-since-removed';
		const staleFile = join(store.presetsDir, 'gone-tissue.json');
		writeFileSync(staleFile, JSON.stringify(record));
		return {home, store, staleFile, text: readFileSync(staleFile, 'utf8')};
	}

	it('are reported by list, kept byte for byte, and not silently dropped', () => {
		const {store, staleFile, text} = storeWithStale();
		const {presets, problems} = store.list();
		expect(presets.map((p) => p.id)).toContain('user:still-good');
		expect(presets.map((p) => p.id)).not.toContain('user:gone-tissue');
		expect(problems).toHaveLength(1);
		expect(problems[0]).toMatch(/user:gone-tissue .* no longer validates/);
		expect(problems[0]).toMatch(/plan\.layers\.1\.tissue: unknown tissue id "tissue-since-removed"/);
		expect(readFileSync(staleFile, 'utf8')).toBe(text);
	});

	it('get explains, save over it needs --force, and delete removes it', () => {
		const {store, staleFile} = storeWithStale();
		expect(store.find('Gone tissue')).toBeUndefined();
		expect(() => store.get('Gone tissue')).toThrow(PresetInvalidError);
		expect(() => store.save('Gone tissue', plan())).toThrow(/already exists but does not validate|already exists/);
		expect(store.remove('user:gone-tissue').id).toBe('user:gone-tissue');
		expect(existsSync(staleFile)).toBe(false);
	});

	it('a record written by a newer version is reported and left unchanged', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		const file = join(store.presetsDir, 'from-the-future.json');
		store.save('Placeholder', plan());
		const text = JSON.stringify({
			record: 'evenecho-preset',
			version: 3,
			name: 'From the future',
			plan: {},
			extra: true,
		});
		writeFileSync(file, text);
		expect(store.list().problems.join()).toMatch(/newer evenecho \(record version 3/);
		expect(readFileSync(file, 'utf8')).toBe(text);
	});
});

describe('export and import', () => {
	it('round-trips user presets through a bundle file', () => {
		const a = openPresetStore({home: tempHome()});
		a.save('Round trip one', plan());
		a.copy('neck-superficial', 'Round trip two');
		const file = join(tempHome(), 'bundle.json');
		const done = a.exportTo(file);
		expect(done.presets.map((p) => p.id)).toEqual(['user:round-trip-one', 'user:round-trip-two']);
		const bundle = JSON.parse(readFileSync(file, 'utf8')) as {format: string; presets: Array<{name: string}>};
		expect(bundle.format).toBe('evenecho-presets/1');
		expect(bundle.presets.map((p) => p.name)).toEqual(['Round trip one', 'Round trip two']);

		const b = openPresetStore({home: tempHome()});
		const imported = b.importFrom(file);
		expect(imported.map((p) => p.id)).toEqual(['user:round-trip-one', 'user:round-trip-two']);
		expect(b.get('Round trip two').plan).toEqual(a.get('Round trip two').plan);
	});

	it('exports named presets, templates included, and refuses to replace a file unless asked', () => {
		const store = openPresetStore({home: tempHome()});
		const file = join(tempHome(), 'two.json');
		expect(store.exportTo(file, ['breast', 'kidney', 'breast']).presets.map((p) => p.id)).toEqual(['breast', 'kidney']);
		expect(() => store.exportTo(file, ['breast'])).toThrow(/already exists; use --force/);
		expect(store.exportTo(file, ['breast'], {overwrite: true}).presets).toHaveLength(1);
		expect(() => store.exportTo(join(tempHome(), 'none.json'))).toThrow(/no user presets to export/);
		expect(() => store.exportTo(join(tempHome(), 'x.json'), ['nothing-here'])).toThrow(PresetNotFoundError);
	});

	it("imports one plan file under the plan's own name", () => {
		const home = tempHome();
		const file = join(home, 'one-plan.json');
		writeFileSync(file, JSON.stringify({...plan(), name: 'Imported single'}));
		const store = openPresetStore({home});
		expect(store.importFrom(file).map((p) => p.id)).toEqual(['user:imported-single']);
	});

	it('refuses an import whose names exist (all named), unless forced', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		store.save('Clash one', plan());
		store.save('Clash two', plan());
		const file = join(tempHome(), 'clash.json');
		store.exportTo(file);
		const before = snapshotDir(home);
		try {
			store.importFrom(file);
			expect.unreachable();
		} catch (error) {
			expect(error).toBeInstanceOf(PresetExistsError);
			expect((error as PresetExistsError).details).toHaveLength(2);
		}
		expect(snapshotDir(home)).toEqual(before);
		expect(store.importFrom(file, {overwrite: true})).toHaveLength(2);
	});
});
