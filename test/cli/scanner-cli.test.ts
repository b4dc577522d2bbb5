/**
 * `evenecho scanner …` as a user runs it: calibrate a session into a stored profile, the profile
 * commands, plans that name a profile, and every bad input of the issue refused with exit 2, the
 * field named and the store unchanged.
 */
import {cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, beforeAll, describe, expect, it} from 'vitest';
import {writeDicom} from '../helpers/dicom-fixture.js';
import {writeSession, type WrittenSession} from '../helpers/phantom-session.js';
import {runCli} from '../helpers/run-cli.js';
import {snapshotDir} from '../helpers/temp-home.js';

const root = mkdtempSync(join(tmpdir(), 'evenecho-scanner-cli-'));
afterAll(() => rmSync(root, {recursive: true, force: true}));

let good: WrittenSession;
beforeAll(() => {
	good = writeSession(join(root, 'good'), 'dicom', {seed: 21});
});

function freshHome(): string {
	return mkdtempSync(join(root, 'home-'));
}

function listing(home: string): string[] {
	const dir = join(home, 'scanner-profiles');
	return existsSync(dir) ? readdirSync(dir).sort() : [];
}

const plan = (scanner?: string) => ({
	format: 'evenecho-plan/2',
	name: 'Invented patient, 4 cm fat',
	layers: [
		{tissue: 'fat', thicknessCm: 4},
		{tissue: 'liver', thicknessCm: 20},
	],
	probe: {centerMhz: 3.5, bandwidthFraction: 0.6},
	display: {depthCm: 16},
	...(scanner ? {scanner} : {}),
});

describe('scanner calibrate and the profile commands', () => {
	it('calibrates, stores, lists, shows, renames, exports, deletes and imports', () => {
		const home = freshHome();
		const env = {EVENECHO_HOME: home};
		const cal = runCli(['scanner', 'calibrate', good.sessionPath, '--name', 'Cart B abdomen', '--format', 'json'], {
			env,
		});
		expect(cal.stderr).toContain('stored scanner profile cart-b-abdomen');
		expect(cal.status).toBe(0);
		const profile = JSON.parse(cal.stdout);
		for (const key of [
			'id',
			'label',
			'greyMap',
			'depthResponse',
			'sliderTravelDb',
			'noiseFloor',
			'penetrationCm',
			'noiseBudgetDb',
		])
			expect(profile).toHaveProperty(key);
		expect(profile.id).toBe('cart-b-abdomen');
		expect(profile.greyMap[0]).toHaveProperty('grey');
		expect(profile.depthResponse[0].depthCm).toBeLessThanOrEqual(1);
		expect(Math.abs(profile.penetrationCm - good.series.truth.penetrationCm)).toBeLessThan(1);

		const again = runCli(['scanner', 'calibrate', good.sessionPath, '--name', 'Cart B abdomen'], {env});
		expect(again.status).toBe(2);
		expect(again.stderr).toContain('already exists; use --force');

		const list = runCli(['scanner', 'list'], {env});
		expect(list.stdout).toMatch(/cart-b-abdomen\s+Cart B abdomen\s+3\.5 MHz\s+16 cm/);
		const show = runCli(['scanner', 'show', 'cart-b-abdomen'], {env});
		expect(show.stdout).toContain('depth response');
		expect(show.stdout).toContain('penetration:');
		expect(show.stdout).toContain('confirm on the live image');

		const renamed = runCli(['scanner', 'rename', 'cart-b-abdomen', 'Cart B deep'], {env});
		expect(renamed.stdout.trim()).toBe('cart-b-deep');
		expect(listing(home)).toEqual(['cart-b-deep.json']);

		const bundle = join(root, 'bundle.json');
		expect(runCli(['scanner', 'export', bundle], {env}).status).toBe(0);
		expect(runCli(['scanner', 'export', bundle], {env}).status).toBe(2);
		expect(runCli(['scanner', 'delete', 'cart-b-deep'], {env}).status).toBe(0);
		expect(listing(home)).toEqual([]);
		const imported = runCli(['scanner', 'import', bundle], {env});
		expect(imported.stdout.trim()).toBe('cart-b-deep');
		expect(runCli(['scanner', 'import', bundle], {env}).status).toBe(2);
	}, 180_000);

	it('refuses hostile or damaged imports and changes nothing', () => {
		const home = freshHome();
		const env = {EVENECHO_HOME: home};
		expect(runCli(['scanner', 'calibrate', good.sessionPath], {env}).status).toBe(0);
		const before = listing(home);
		const stored = JSON.parse(readFileSync(join(home, 'scanner-profiles', before[0]!), 'utf8'));
		const cases: Array<[string, string]> = [
			[
				'proto.json',
				JSON.stringify({...stored, id: 'x', name: 'x'}).replace('"format"', '"__proto__":{"polluted":1},"format"'),
			],
			['nan.json', JSON.stringify({...stored, id: 'other', name: 'other', penetrationCm: 'deep'})],
			['control.json', JSON.stringify({...stored, id: 'other', name: 'other', label: 'evil\u001b[2J'})],
			['format.json', JSON.stringify({...stored, format: 'something-else/1'})],
			['path.json', JSON.stringify({...stored, id: '../../escape', name: 'escape'})],
		];
		for (const [name, text] of cases) {
			const file = join(root, name);
			writeFileSync(file, text);
			const r = runCli(['scanner', 'import', file], {env});
			expect(r.status, name).toBe(2);
			expect(r.stderr, name).toMatch(/nothing was imported|not allowed|control/);
			expect(listing(home)).toEqual(before);
		}
	}, 180_000);
});

describe('plans that name a scanner profile', () => {
	it('use the measured depth response and show sliders as a fraction of travel; plans without it are unchanged', () => {
		const home = freshHome();
		const env = {EVENECHO_HOME: home};
		expect(runCli(['scanner', 'calibrate', good.sessionPath, '--name', 'cart b'], {env}).status).toBe(0);
		const withPath = join(root, 'with.json');
		const withoutPath = join(root, 'without.json');
		writeFileSync(withPath, JSON.stringify(plan('cart-b')));
		writeFileSync(withoutPath, JSON.stringify(plan()));
		const measured = JSON.parse(runCli(['curve', withPath, '--format', 'json'], {env}).stdout);
		const assumed = JSON.parse(runCli(['curve', withoutPath, '--format', 'json'], {env}).stdout);
		expect(measured.scanner.id).toBe('cart-b');
		expect(measured.sliders[0]).toHaveProperty('travelFraction');
		expect(assumed.sliders[0]).not.toHaveProperty('travelFraction');
		expect(assumed).not.toHaveProperty('scanner');
		expect(measured.warnings.map((w: {code: string}) => w.code)).toContain('scanner-profile');
		// Slider positions are reachable on the measured scanner: within ± full travel.
		for (const s of measured.sliders) expect(Math.abs(s.travelFraction)).toBeLessThanOrEqual(1 + 1e-9);
		// The measured noise budget replaces the assumed one.
		expect(measured.noiseBudgetDb).not.toBe(assumed.noiseBudgetDb);
		const text = runCli(['curve', withPath], {env}).stdout;
		expect(text).toContain('of travel');
		expect(text).toContain('measured on');
		const table = runCli(['table', withPath, '--fat', '2,6', '--format', 'csv'], {env});
		expect(table.status).toBe(0);
		const ladder = JSON.parse(runCli(['ladder', withPath, '--format', 'json'], {env}).stdout);
		expect(ladder.noiseBudgetDb).toBeCloseTo(measured.noiseBudgetDb, 2);
	}, 180_000);

	it('a plan naming a missing profile is refused by field', () => {
		const home = freshHome();
		const p = join(root, 'missing.json');
		writeFileSync(p, JSON.stringify(plan('no-such-cart')));
		const r = runCli(['curve', p], {env: {EVENECHO_HOME: home}});
		expect(r.status).toBe(2);
		expect(r.stderr).toContain('scanner: no scanner profile "no-such-cart"');
		expect(r.stdout).toBe('');
	});
});

describe('bad sessions: exit 2, the field named, the store unchanged', () => {
	const colourOnly = (dir: string) => {
		const w = 64;
		const px = new Uint8Array(w * w * 3);
		for (let i = 0; i < w * w; i++) px.set([200, 60, 10], 3 * i);
		writeFileSync(
			join(dir, 'colour.dcm'),
			writeDicom({
				rows: w,
				columns: w,
				pixels: px,
				photometric: 'RGB',
				samples: 3,
				planar: 0,
				regions: [{minX0: 0, minY0: 0, maxX1: w - 1, maxY1: w - 1, deltaY: 0.25}],
			}),
		);
	};
	type Steps = Array<{image: string}>;
	const cases: Array<{name: string; field: RegExp; edit: (s: Record<string, unknown>, dir: string) => void}> = [
		{
			name: 'missing image',
			field: /gainSteps\.2\.image: gone\.dcm: no such file/,
			edit: (s) => ((s['gainSteps'] as Steps)[2]!.image = 'gone.dcm'),
		},
		{
			name: 'wrong format',
			field: /format: must be "evenecho-scanner-session\/1"/,
			edit: (s) => (s['format'] = 'evenecho-session/9'),
		},
		{
			name: 'two gain steps',
			field: /gainSteps: must list at least 3 images/,
			edit: (s) => (s['gainSteps'] = (s['gainSteps'] as unknown[]).slice(0, 2)),
		},
		{
			name: 'steps that do not overlap',
			field: /gainSteps: the steps overlap too little to stitch/,
			edit: (s) => (s['gainSteps'] = (s['gainSteps'] as unknown[]).filter((_, i) => i % 3 === 0)),
		},
		{
			name: 'a region outside the pixels',
			field: /gainSteps\.0\.image: .*\(0018,601E\) Region Location Max Y1: .*inside the image/,
			edit: (s, dir) => {
				writeFileSync(
					join(dir, 'outside.dcm'),
					writeDicom({
						rows: 50,
						columns: 50,
						pixels: new Uint8Array(2500),
						regions: [{minX0: 0, minY0: 0, maxX1: 49, maxY1: 50, deltaY: 0.1}],
					}),
				);
				(s['gainSteps'] as Steps)[0]!.image = 'outside.dcm';
			},
		},
		{
			name: 'an RGB image with only colour',
			field: /gainSteps\.1\.image: colour\.dcm: only 0 % of the measured pixels are grey/,
			edit: (s, dir) => {
				colourOnly(dir);
				(s['gainSteps'] as Steps)[1]!.image = 'colour.dcm';
			},
		},
		{
			name: 'a size claim over the cap',
			field: /gainSteps\.0\.image: .*\(0028,0010\) Rows: is 9000/,
			edit: (s, dir) => {
				writeFileSync(
					join(dir, 'huge.dcm'),
					writeDicom({
						rows: 9000,
						columns: 16,
						pixels: new Uint8Array(16),
						regions: [{minX0: 0, minY0: 0, maxX1: 15, maxY1: 15, deltaY: 0.1}],
					}),
				);
				(s['gainSteps'] as Steps)[0]!.image = 'huge.dcm';
			},
		},
		{
			name: 'a truncated DICOM',
			field: /gainSteps\.0\.image: cut\.dcm: .*truncated/,
			edit: (s, dir) => {
				const whole = readFileSync(join(dir, (s['gainSteps'] as Steps)[0]!.image));
				writeFileSync(join(dir, 'cut.dcm'), whole.subarray(0, Math.floor(whole.length / 2)));
				(s['gainSteps'] as Steps)[0]!.image = 'cut.dcm';
			},
		},
		{
			name: 'a DICOM with no regions and no pixelScale',
			field: /gainSteps\.0\.image: bare\.dcm: \(0018,6011\) Sequence of Ultrasound Regions: is missing/,
			edit: (s, dir) => {
				writeFileSync(join(dir, 'bare.dcm'), writeDicom({rows: 50, columns: 50, pixels: new Uint8Array(2500)}));
				(s['gainSteps'] as Steps)[0]!.image = 'bare.dcm';
			},
		},
	];

	// A store that already holds a profile, so "unchanged" is tested on real content: each bad
	// session is run with --force under that profile's name, and the profile must survive byte for byte.
	let seeded = '';
	beforeAll(() => {
		seeded = freshHome();
		const r = runCli(['scanner', 'calibrate', good.sessionPath, '--name', 'Cart A'], {env: {EVENECHO_HOME: seeded}});
		expect(r.status, r.stderr).toBe(0);
	}, 120_000);

	it.each(cases)(
		'$name',
		({name, field, edit}) => {
			const dir = join(root, `bad-${name.replace(/\W+/g, '-')}`);
			const written = writeSession(dir, 'dicom', {seed: 3, width: 200, height: 200}, (s) => edit(s, dir));
			const home = freshHome();
			cpSync(seeded, home, {recursive: true});
			const before = snapshotDir(home);
			expect(Object.keys(before)).toContain(join('scanner-profiles', 'cart-a.json'));
			const r = runCli(['scanner', 'calibrate', written.sessionPath, '--name', 'Cart A', '--force'], {
				env: {EVENECHO_HOME: home},
			});
			expect(r.stderr).toMatch(field);
			expect(r.status).toBe(2);
			expect(r.stderr).not.toMatch(/\n\s+at /);
			expect(r.stdout).toBe('');
			expect(snapshotDir(home)).toEqual(before);
		},
		60_000,
	);
});
