/**
 * `evenecho presets …` end to end, through the built CLI on a temporary EVENECHO_HOME: data on
 * stdout, messages on stderr, exit 2 with one clear message (and no stack trace) on bad input.
 */
import {existsSync, readFileSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {beforeAll, describe, expect, it} from 'vitest';
import {demoPlanJson} from '../../src/plan/demo-plan.js';
import {assertBuilt, cleanTempHomes, repoRoot, runCli, snapshotDir, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();
beforeAll(() => assertBuilt());

function expectBadInput(r: {status: number | null; stdout: string; stderr: string}, message: RegExp): void {
	expect(r.status).toBe(2);
	expect(r.stdout).toBe('');
	expect(r.stderr).toMatch(message);
	expect(r.stderr).not.toMatch(/\n\s+at |internal error/);
}

function planFile(dir: string, name = 'plan.json', content: unknown = demoPlanJson): string {
	const file = join(dir, name);
	writeFileSync(file, JSON.stringify(content));
	return file;
}

describe('presets list and show', () => {
	it('lists templates (found from dist) and user presets together, with id, name, region and kind', () => {
		const home = tempHome();
		expect(runCli(['presets', 'save', 'Ward Heron liver', '--from', planFile(home)], home).status).toBe(0);
		const r = runCli(['presets', 'list'], home);
		expect(r.status).toBe(0);
		const lines = r.stdout.trimEnd().split('\n');
		expect(lines[0]).toMatch(/^id\s+name\s+region\s+kind$/);
		expect(lines).toContainEqual(
			expect.stringMatching(/^upper-abdomen\s+Upper abdomen – liver\s+upper-abdomen\s+template$/),
		);
		expect(lines.at(-1)).toMatch(/^user:ward-heron-liver\s+Ward Heron liver\s+upper-abdomen\s+user preset$/);
		expect(lines.filter((l) => l.endsWith(' template'))).toHaveLength(9);
		expect(r.stderr).toMatch(/9 templates, 1 user preset \(store: /);
	});

	it('list --format json gives the store folder, the presets and the problems', () => {
		const home = tempHome();
		const r = runCli(['presets', 'list', '--format', 'json'], home);
		expect(r.status).toBe(0);
		const j = JSON.parse(r.stdout) as {
			store: string;
			presets: Array<{id: string; isTemplate: boolean}>;
			problems: string[];
		};
		expect(j.store).toBe(home);
		expect(j.problems).toEqual([]);
		expect(j.presets.find((p) => p.id === 'breast')).toEqual({
			id: 'breast',
			name: 'Breast – glandular tissue',
			region: 'breast',
			isTemplate: true,
		});
	});

	it('show prints who the preset is, its note, and the curve summary with the cautions', () => {
		const r = runCli(['presets', 'show', 'obstetric-second-trimester'], tempHome());
		expect(r.status).toBe(0);
		expect(r.stdout).toMatch(
			/^obstetric-second-trimester {2}"Obstetric – second trimester" {2}\[obstetric\]\n {2}built-in template, read-only/,
		);
		expect(r.stdout).toMatch(/Carson, Rubin & Chiang 1989/);
		expect(r.stdout).toMatch(/Depth-gain starting point/);
		expect(r.stdout).toMatch(/Receive gain|receive gain/);
		expect(r.stdout).toMatch(/not a diagnosis/);
	});

	it('show --format json gives the preset with a plan the curve command accepts', () => {
		const home = tempHome();
		const r = runCli(['presets', 'show', 'Neck – thyroid, superficial', '--format', 'json'], home);
		expect(r.status).toBe(0);
		const j = JSON.parse(r.stdout) as {id: string; isTemplate: boolean; plan: {format: string}};
		expect(j).toMatchObject({id: 'neck-superficial', isTemplate: true});
		expect(j.plan.format).toBe('evenecho-plan/2');
		const curve = runCli(['curve', '-'], home, JSON.stringify(j.plan));
		expect(curve.status).toBe(0);
	});

	it('bad input exits 2 naming the problem', () => {
		const home = tempHome();
		expectBadInput(
			runCli(['presets', 'show', 'nothing-by-this-name'], home),
			/no preset with the id or name "nothing-by-this-name"/,
		);
		expectBadInput(
			runCli(['presets', 'list', '--format', 'xml'], home),
			/--format: must be one of text, json \(got "xml"\)/,
		);
	});
});

describe('presets save, rename, copy, delete', () => {
	it('saves from a file or standard input, refuses to replace without --force, and prints the id', () => {
		const home = tempHome();
		const file = planFile(home);
		const first = runCli(['presets', 'save', 'Bed 7', '--from', file], home);
		expect(first.status).toBe(0);
		expect(first.stdout).toBe('user:bed-7\n');
		expect(first.stderr).toMatch(/saved "Bed 7" as user:bed-7/);
		const before = snapshotDir(home);
		expectBadInput(
			runCli(['presets', 'save', 'bed 7', '--from', '-'], home, JSON.stringify(demoPlanJson)),
			/already exists \(user:bed-7\); use --force/,
		);
		expect(snapshotDir(home)).toEqual(before);
		const forced = runCli(
			['presets', 'save', 'bed 7', '--from', '-', '--force'],
			home,
			JSON.stringify({...demoPlanJson, note: 'replaced'}),
		);
		expect(forced.status).toBe(0);
		expect(JSON.parse(readFileSync(join(home, 'presets', 'bed-7.json'), 'utf8')).plan.note).toBe('replaced');
	});

	it('saving under a template name says the template is unchanged and which id is yours', () => {
		const home = tempHome();
		const r = runCli(
			['presets', 'save', 'Kidney – right, through the liver', '--from', join(repoRoot, 'presets', 'kidney.json')],
			home,
		);
		expect(r.status).toBe(0);
		expect(r.stderr).toMatch(
			/the built-in template kidney stays as it is; your copy is user:kidney-right-through-the-liver/,
		);
		const shown = runCli(['presets', 'show', 'kidney – right, through the liver'], home);
		expect(shown.stdout).toMatch(/^user:kidney-right-through-the-liver/);
		expect(shown.stderr).toMatch(/show it by its id: evenecho presets show kidney/);
	});

	it('rejects a bad name, a bad plan and a missing --from with exit 2, saving nothing', () => {
		const home = tempHome();
		const bad = planFile(home, 'bad.json', {...demoPlanJson, probe: {centerMhz: 0}});
		expectBadInput(
			runCli(['presets', 'save', '../escape', '--from', planFile(home)], home),
			/name: "\.\.\/escape" contains characters a preset name cannot have/,
		);
		expectBadInput(
			runCli(['presets', 'save', 'Fine', '--from', bad], home),
			/bad\.json: not a valid plan\n\s+probe\.centerMhz: must be a number above 0 and up to 50 MHz/,
		);
		expect(runCli(['presets', 'save', 'Fine'], home).status).toBe(2);
		expect(existsSync(join(home, 'presets'))).toBe(false);
	});

	it('renames, copies and deletes; templates stay read-only', () => {
		const home = tempHome();
		runCli(['presets', 'save', 'First', '--from', planFile(home)], home);
		const renamed = runCli(['presets', 'rename', 'first', 'Second'], home);
		expect(renamed.status).toBe(0);
		expect(renamed.stdout).toBe('user:second\n');
		const copied = runCli(['presets', 'copy', 'breast', 'My breast'], home);
		expect(copied.stdout).toBe('user:my-breast\n');
		expect(runCli(['presets', 'delete', 'user:second'], home).stderr).toMatch(/deleted "Second" \(user:second\)/);
		expectBadInput(
			runCli(['presets', 'rename', 'breast', 'Anything'], home),
			/"breast" is a built-in template and cannot be renamed/,
		);
		expectBadInput(
			runCli(['presets', 'delete', 'breast'], home),
			/"breast" is a built-in template and cannot be deleted/,
		);
		expectBadInput(runCli(['presets', 'copy', 'My breast', 'my-breast'], home), /already exists/);
		const ids = (
			JSON.parse(runCli(['presets', 'list', '--format', 'json'], home).stdout) as {
				presets: Array<{id: string; isTemplate: boolean}>;
			}
		).presets
			.filter((p) => !p.isTemplate)
			.map((p) => p.id);
		expect(ids).toEqual(['user:my-breast']);
	});
});

describe('presets export and import', () => {
	it('exports to a file or standard output and imports it into another store', () => {
		const a = tempHome();
		runCli(['presets', 'save', 'Export me', '--from', planFile(a)], a);
		runCli(['presets', 'copy', 'shoulder-tendon', 'My shoulder'], a);
		const file = join(tempHome(), 'team.json');
		const exported = runCli(['presets', 'export', file], a);
		expect(exported.status).toBe(0);
		expect(exported.stderr).toMatch(/exported 2 presets to /);
		expectBadInput(runCli(['presets', 'export', file], a), /already exists; use --force/);
		const toStdout = runCli(['presets', 'export', '-', 'upper-abdomen'], a);
		expect((JSON.parse(toStdout.stdout) as {presets: unknown[]}).presets).toHaveLength(1);

		const b = tempHome();
		const imported = runCli(['presets', 'import', file], b);
		expect(imported.status).toBe(0);
		expect(imported.stdout).toBe('user:export-me\nuser:my-shoulder\n');
		expectBadInput(
			runCli(['presets', 'import', file], b),
			/2 user presets with these names already exist; use --force/,
		);
		expect(runCli(['presets', 'import', file, '--force'], b).status).toBe(0);
	});

	it('a hostile import exits 2, names the problem, and changes nothing', () => {
		const home = tempHome();
		runCli(['presets', 'save', 'Keep me', '--from', planFile(home)], home);
		const before = snapshotDir(home);
		const evil = join(tempHome(), 'evil.json');
		writeFileSync(
			evil,
			JSON.stringify({...demoPlanJson, name: 'Evil'}).replace('"probe":{', '"probe":{"__proto__":{"isAdmin":true},'),
		);
		expectBadInput(
			runCli(['presets', 'import', evil], home),
			/evil\.json: probe\.__proto__: the key "__proto__" is not allowed; nothing was imported/,
		);
		expectBadInput(
			runCli(['presets', 'import', join(home, 'no-such-file.json')], home),
			/no-such-file\.json: no such file; nothing was imported/,
		);
		expect(snapshotDir(home)).toEqual(before);
	});
});
