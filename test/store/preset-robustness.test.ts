/**
 * "Nothing is lost": damaged store files, hostile import files, two processes saving at once, and
 * a process killed in the middle of writing. Each runs against a real temporary store folder.
 */
import {spawn} from 'node:child_process';
import {existsSync, readdirSync, readFileSync, utimesSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {beforeAll, describe, expect, it} from 'vitest';
import {demoPlan} from '../../src/plan/demo-plan.js';
import {decodeRecord} from '../../src/store/preset-record.js';
import {openPresetStore} from '../../src/store/preset-store.js';
import {PresetImportError, PresetNameError, PresetStoreError} from '../../src/store/store-errors.js';
import {maxPlanBytes as maxPresetFileBytes} from '../../src/files/bounded-read.js';
import {assertBuilt, cleanTempHomes, repoRoot, runCli, snapshotDir, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

const fixture = (name: string) => join(repoRoot, 'test', 'fixtures', 'presets', name);

describe('a damaged store file', () => {
	it('a preset file that is not JSON: the rest lists, the file is kept as a backup beside it, a notice says so', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		store.save('Healthy', demoPlan());
		const broken = join(store.presetsDir, 'broken.json');
		const garbage = '{"record": "evenecho-preset", "version": 2, "name": "Brok\u0000\u00ff garbage';
		writeFileSync(broken, garbage);

		const again = openPresetStore({home});
		const {presets, problems} = again.list();
		expect(problems).toEqual([]);
		expect(presets.filter((p) => !p.isTemplate).map((p) => p.id)).toEqual(['user:healthy']);
		const backups = readdirSync(again.presetsDir).filter((f) => f.startsWith('broken.json.damaged-'));
		expect(backups).toHaveLength(1);
		expect(readFileSync(join(again.presetsDir, backups[0]!), 'utf8')).toBe(garbage);
		expect(again.notices.join('\n')).toMatch(
			/broken\.json was damaged \(not valid JSON.*\); kept it as .*broken\.json\.damaged-/,
		);
		// The user goes on: saving works, and the next listing is quiet.
		again.save('After the damage', demoPlan());
		const third = openPresetStore({home});
		expect(third.list().presets.filter((p) => !p.isTemplate)).toHaveLength(2);
		expect(third.notices).toEqual([]);
	});

	it('an empty (truncated) preset file is treated the same way', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		store.save('Truncated', demoPlan());
		writeFileSync(join(store.presetsDir, 'truncated.json'), '');
		const again = openPresetStore({home});
		expect(again.list().presets.some((p) => p.id === 'user:truncated')).toBe(false);
		expect(again.notices.join()).toMatch(/truncated\.json was damaged/);
		expect(readdirSync(again.presetsDir).some((f) => f.startsWith('truncated.json.damaged-'))).toBe(true);
	});

	it('a damaged settings file (config.json): the store opens, keeps a backup, rewrites it, presets untouched', () => {
		const home = tempHome();
		openPresetStore({home}).save('Survivor', demoPlan());
		const garbage = 'this is {not json';
		writeFileSync(join(home, 'config.json'), garbage);
		const store = openPresetStore({home});
		expect(store.notices.join()).toMatch(
			/settings file .*config\.json was damaged .*kept it as .*config\.json\.damaged-.*presets are not affected/,
		);
		const backup = readdirSync(home).find((f) => f.startsWith('config.json.damaged-'));
		expect(backup).toBeDefined();
		expect(readFileSync(join(home, backup!), 'utf8')).toBe(garbage);
		expect(JSON.parse(readFileSync(join(home, 'config.json'), 'utf8'))).toMatchObject({recordVersion: 2});
		expect(store.get('Survivor').id).toBe('user:survivor');
	});

	it('a settings file that is JSON but not an object is handled too', () => {
		const home = tempHome();
		openPresetStore({home});
		writeFileSync(join(home, 'config.json'), '[1, 2, 3]');
		const store = openPresetStore({home});
		expect(store.notices.join()).toMatch(/config\.json was damaged \(not a JSON object\)/);
	});

	it('the CLI still starts on a damaged store: exit 0, the list on stdout, the notice on stderr', () => {
		assertBuilt();
		const home = tempHome();
		openPresetStore({home}).save('Survivor', demoPlan());
		writeFileSync(join(home, 'config.json'), '\u0000\u0001garbage');
		writeFileSync(join(home, 'presets', 'hand-broken.json'), '{"name": "Hand broken", ');
		const r = runCli(['presets', 'list'], home);
		expect(r.status).toBe(0);
		expect(r.stdout).toMatch(/user:survivor\s+Survivor/);
		expect(r.stderr).toMatch(/note: the store's settings file .* was damaged/);
		expect(r.stderr).toMatch(/note: user preset file .*hand-broken\.json was damaged/);
		expect(r.stderr).not.toMatch(/\n\s+at /);
	});

	it('the CLI reports a preset that no longer validates: listed as a problem, show exits 2 with the reason', () => {
		assertBuilt();
		const home = tempHome();
		const saved = openPresetStore({home}).save('Out of range', demoPlan());
		const record = JSON.parse(readFileSync(saved.file, 'utf8')) as {plan: {probe: {centerMhz: number}}};
		record.plan.probe.centerMhz = 99;
		writeFileSync(saved.file, JSON.stringify(record));
		const list = runCli(['presets', 'list'], home);
		expect(list.status).toBe(0);
		const kept = 'problem: user preset user:out-of-range .* no longer validates and is kept as it is: ';
		const why = 'plan\\.probe\\.centerMhz: must be a number above 0 and up to 50 MHz';
		expect(list.stderr).toMatch(new RegExp(kept + why));
		const show = runCli(['presets', 'show', 'Out of range'], home);
		expect(show.status).toBe(2);
		expect(show.stdout).toBe('');
		expect(show.stderr).toMatch(/user preset user:out-of-range .* no longer validates; fix the file or delete it/);
		expect(show.stderr).toMatch(/\n {2}plan\.probe\.centerMhz: must be a number/);
		expect(runCli(['presets', 'delete', 'Out of range'], home).status).toBe(0);
	});

	it('stray temporary files from a crash are skipped, and swept once they are old', () => {
		const home = tempHome();
		const store = openPresetStore({home});
		store.save('Real', demoPlan());
		const young = join(store.presetsDir, '.real.json.999.abcd.tmp');
		const old = join(store.presetsDir, '.other.json.998.ef01.tmp');
		writeFileSync(young, '{"half": ');
		writeFileSync(old, '{"half": ');
		const twoHoursAgo = new Date(Date.now() - 2 * 3600_000);
		utimesSync(old, twoHoursAgo, twoHoursAgo);
		const {presets, problems} = store.list();
		expect(problems).toEqual([]);
		expect(presets.filter((p) => !p.isTemplate).map((p) => p.id)).toEqual(['user:real']);
		expect(readdirSync(store.presetsDir).sort()).toEqual(['.real.json.999.abcd.tmp', 'real.json']);
	});
});

describe('hostile import files leave the store unchanged', () => {
	let home: string;
	let before: Record<string, string>;
	const good = () => ({...demoPlan(), name: 'Fine name'});

	/** A store holding one preset; `before` is its exact content. */
	function freshStore() {
		home = tempHome();
		const store = openPresetStore({home});
		store.save('Already here', demoPlan());
		before = snapshotDir(home);
		return store;
	}

	function importing(content: string | Buffer, overwrite = false) {
		const store = freshStore();
		const file = join(tempHome(), 'incoming.json');
		writeFileSync(file, content);
		let thrown: unknown;
		try {
			store.importFrom(file, {overwrite});
		} catch (error) {
			thrown = error;
		}
		expect(snapshotDir(home)).toEqual(before);
		expect(thrown).toBeInstanceOf(PresetStoreError);
		const e = thrown as PresetStoreError;
		return {error: e, text: [e.message, ...e.details].join('\n')};
	}

	it('refuses a file over the size cap without parsing it', () => {
		const {error, text} = importing(Buffer.alloc(maxPresetFileBytes + 10, 0x20));
		expect(error).toBeInstanceOf(PresetImportError);
		expect(text).toMatch(
			new RegExp(
				`${(maxPresetFileBytes + 10).toLocaleString('en-US')} bytes; over the limit of ${maxPresetFileBytes.toLocaleString('en-US')} bytes`,
			),
		);
	});

	it('refuses a __proto__ key anywhere, naming where', () => {
		const json = JSON.stringify({...good(), probe: {centerMhz: 3.5}}).replace(
			'"probe":{',
			'"probe":{"__proto__":{"polluted":true},',
		);
		const {text} = importing(json);
		expect(text).toMatch(/probe\.__proto__: the key "__proto__" is not allowed/);
		expect(({} as Record<string, unknown>)['polluted']).toBeUndefined();
	});

	it('refuses a constructor key inside a bundle entry', () => {
		const bundle = JSON.stringify({format: 'evenecho-presets/1', presets: [good()]}).replace(
			'"layers":[{',
			'"layers":[{"constructor":{"prototype":{"x":1}},',
		);
		expect(importing(bundle).text).toMatch(/presets\.0\.layers\.0\.constructor: the key "constructor" is not allowed/);
	});

	it('refuses nesting deeper than any plan needs', () => {
		const deep = '{"name": "Deep", "layers": ' + '['.repeat(5000) + ']'.repeat(5000) + '}';
		expect(importing(deep).text).toMatch(/nested deeper than 16 levels/);
	});

	it.each([
		['path characters', '../../outside'],
		['a control character', 'bell\u0007name'],
		['a leading dot', '.profile'],
		['too long', 'n'.repeat(61)],
		['a Windows device name', 'NUL'],
		['not text', 42],
	])('refuses a name with %s', (_what, name) => {
		const {text} = importing(JSON.stringify({...good(), name}));
		expect(text).toMatch(/name: /);
		expect(text).toMatch(/nothing was imported/);
	});

	it('a bad name never reaches the terminal raw', () => {
		const {text} = importing(JSON.stringify({...good(), name: 'esc\u001b[2Jape'}));
		expect(text).toMatch(/name: contains a control or invisible formatting character/);
		expect(text).not.toContain('\u001b');
	});

	it('refuses terminal control sequences hidden in other text fields (region, note)', () => {
		expect(importing(JSON.stringify({...good(), region: 'x\u001b]0;owned\u0007'})).text).toMatch(
			/region: contains a control or invisible formatting character/,
		);
		expect(importing(JSON.stringify({...good(), note: 'fine\u202eenil'})).text).toMatch(
			/note: contains a control or invisible formatting character/,
		);
	});

	it('refuses a plan without a name (import takes the name from the file)', () => {
		const {name: _drop, ...unnamed} = good();
		expect(importing(JSON.stringify(unnamed)).text).toMatch(/name: missing/);
	});

	it('refuses the wrong schema: unknown fields, values out of range, another format', () => {
		expect(importing(JSON.stringify({...good(), gainKnob: 3})).text).toMatch(/unknown field "gainKnob"/);
		expect(importing(JSON.stringify({...good(), probe: {centerMhz: 500}})).text).toMatch(
			/probe\.centerMhz: must be a number above 0 and up to 50 MHz/,
		);
		expect(importing(JSON.stringify({format: 'someone-elses/3', presets: []})).text).toMatch(
			/format: must be "evenecho-presets\/1" .* or "evenecho-plan\/2"/,
		);
		expect(importing('[1, 2, 3]').text).toMatch(/must be a plan object/);
		expect(importing('not json at all').text).toMatch(/not valid JSON/);
	});

	it('refuses a whole bundle when one entry is bad, listing each problem', () => {
		const bundle = {
			format: 'evenecho-presets/1',
			presets: [
				good(),
				{...good(), name: 'Second', layers: [{tissue: 'unobtainium', thicknessCm: 1}]},
				{...good(), name: 'fine NAME'},
			],
		};
		const {text} = importing(JSON.stringify(bundle));
		expect(text).toMatch(/presets\.1\.layers\.0\.tissue: unknown tissue id "unobtainium"/);
		expect(text).toMatch(/presets\.2\.name: "fine NAME" is the same preset name as presets\.0/);
	});

	it('refuses a bundle with unknown top-level fields or no presets', () => {
		expect(importing(JSON.stringify({format: 'evenecho-presets/1', presets: [good()], run: 'rm -rf /'})).text).toMatch(
			/unknown field "run"/,
		);
		expect(importing(JSON.stringify({format: 'evenecho-presets/1', presets: []})).text).toMatch(
			/presets: must be a list of 1 to 500 plans/,
		);
	});

	it('a name clash refuses the whole import, even with other new names in it', () => {
		const bundle = {format: 'evenecho-presets/1', presets: [good(), {...good(), name: 'already HERE'}]};
		expect(importing(JSON.stringify(bundle)).text).toMatch(/already exists.*nothing was imported/);
	});

	it('imported names pass the same check as saved ones', () => {
		expect(() => openPresetStore({home: tempHome()}).save('a\u202eb', demoPlan())).toThrow(PresetNameError);
	});
});

/** Runs a fixture script; resolves with its exit code and output. */
function run(
	script: string,
	args: string[],
): {done: Promise<{code: number | null; stdout: string; stderr: string}>; kill: () => void; stdout: () => string} {
	const child = spawn(process.execPath, [fixture(script), ...args], {stdio: ['ignore', 'pipe', 'pipe']});
	let stdout = '';
	let stderr = '';
	child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
	child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
	const done = new Promise<{code: number | null; stdout: string; stderr: string}>((resolve) =>
		child.on('close', (code) => resolve({code, stdout, stderr})),
	);
	return {done, kill: () => child.kill('SIGKILL'), stdout: () => stdout};
}

describe('two processes at once', () => {
	beforeAll(() => assertBuilt());

	it('two processes each saving 50 presets at the same moment: all 100 survive; shared names go to exactly one', async () => {
		const home = tempHome();
		const go = join(tempHome(), 'go');
		const a = run('save-many.mjs', [home, 'Alpha', '50', go, '10']);
		const b = run('save-many.mjs', [home, 'Bravo', '50', go, '10']);
		const waitStart = Date.now();
		while (!existsSync(`${go}.Alpha.ready`) || !existsSync(`${go}.Bravo.ready`)) {
			if (Date.now() - waitStart > 15_000) throw new Error('the writers did not get ready');
			await new Promise((r) => setTimeout(r, 5));
		}
		writeFileSync(go, 'go');
		const [ra, rb] = await Promise.all([a.done, b.done]);
		expect(ra.stderr + rb.stderr).toBe('');
		type Summary = {saved: number; exists: number; errors: string[]; firstAt: number; lastAt: number};
		const sa = JSON.parse(ra.stdout) as Summary;
		const sb = JSON.parse(rb.stdout) as Summary;
		expect([...sa.errors, ...sb.errors]).toEqual([]);
		// The two really ran at the same time.
		expect(sa.firstAt).toBeLessThan(sb.lastAt);
		expect(sb.firstAt).toBeLessThan(sa.lastAt);
		expect(sa.exists + sb.exists).toBe(10);
		expect(sa.saved + sb.saved).toBe(110);

		const store = openPresetStore({home});
		const {presets, problems} = store.list();
		expect(problems).toEqual([]);
		const names = presets.filter((p) => !p.isTemplate).map((p) => p.name);
		for (let i = 0; i < 50; i++) {
			expect(names).toContain(`Alpha ${i}`);
			expect(names).toContain(`Bravo ${i}`);
		}
		expect(names).toHaveLength(110);
		expect(readdirSync(store.presetsDir).filter((f) => f.endsWith('.tmp'))).toEqual([]);
	}, 30_000);

	it('a process killed while overwriting a preset leaves a whole, valid file (four kills at different moments)', async () => {
		for (const delayMs of [40, 90, 150, 230]) {
			const home = tempHome();
			const loop = run('overwrite-loop.mjs', [home, 'Under fire']);
			const started = Date.now();
			while (!loop.stdout().includes('running')) {
				if (Date.now() - started > 10_000) throw new Error('the writer did not start');
				await new Promise((r) => setTimeout(r, 5));
			}
			await new Promise((r) => setTimeout(r, delayMs)); // many rewrites in flight
			loop.kill();
			await loop.done;
			const store = openPresetStore({home});
			const file = join(store.presetsDir, 'under-fire.json');
			const record = decodeRecord(JSON.parse(readFileSync(file, 'utf8')));
			expect(record.status).toBe('ok');
			expect(store.list().problems).toEqual([]);
			expect(store.notices).toEqual([]);
			expect(store.get('Under fire').plan.layers).toHaveLength(40);
		}
	}, 30_000);
});
