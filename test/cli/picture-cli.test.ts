/**
 * `evenecho preview` and `evenecho simulate` as users run them (the built bundle), on the invented
 * demo plan: files read back with independent decoders, the session file in the scanner-session
 * format, bad input refused with exit 2 and the option named, nothing half-written.
 */
import {chmodSync, existsSync, mkdirSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import dicomParser from 'dicom-parser';
import {decode} from 'fast-png';
import {afterAll, describe, expect, it} from 'vitest';
import {demoPlanJson} from '../../src/plan/demo-plan.js';
import {runCli} from '../helpers/run-cli.js';

const root = mkdtempSync(join(tmpdir(), 'evenecho-pictures-'));
const planPath = join(root, 'plan.json');
writeFileSync(planPath, JSON.stringify(demoPlanJson));
afterAll(() => rmSync(root, {recursive: true, force: true}));

describe('evenecho preview', () => {
	it('--png writes one 8-bit grey panel whose rows map to depth (row r = r/height × display depth)', () => {
		const out = join(root, 'plan.png');
		const r = runCli([
			'preview',
			planPath,
			'--png',
			out,
			'--panel',
			'plan',
			'--width',
			'64',
			'--height',
			'96',
			'--seed',
			'3',
		]);
		expect(r.status, r.stderr).toBe(0);
		expect(r.stdout).toContain('Illustration');
		const png = decode(readFileSync(out));
		expect([png.width, png.height, png.channels, png.depth]).toEqual([64, 96, 1, 8]);
		expect(png.text['Description']).toMatch(/Illustration/);
	}, 60_000);

	it('same seed, same bytes; both panels side by side', () => {
		const a = join(root, 'a.png');
		const b = join(root, 'b.png');
		expect(runCli(['preview', planPath, '--png', a, '--width', '40', '--height', '50']).status).toBe(0);
		expect(runCli(['preview', planPath, '--png', b, '--width', '40', '--height', '50']).status).toBe(0);
		expect(readFileSync(a).equals(readFileSync(b))).toBe(true);
		expect(decode(readFileSync(a)).width).toBe(2 * 40 + 8);
	}, 60_000);

	it('draws in the terminal with plain characters when piped, with the scale, marks and label', () => {
		const r = runCli(['preview', planPath, '--width', '30', '--height', '40']);
		expect(r.status, r.stderr).toBe(0);
		expect(r.stdout).toContain('built-in ramp only');
		expect(r.stdout).toContain('this plan');
		expect(r.stdout).toContain('<1');
		expect(r.stdout).toMatch(/Illustration: a uniform tissue/);
		expect(r.stdout).not.toContain('\u001B[');
	}, 60_000);

	for (const [args, option] of [
		[['--width', '0'], '--width'],
		[['--width', '100000'], '--width'],
		[['--height', '2.5'], '--height'],
		[['--panel', 'left'], '--panel'],
		[['--seed', '-1'], '--seed'],
		[['--dynamic-range', '500'], '--dynamic-range'],
	] as const) {
		it(`refuses ${args.join(' ')}: exit 2 naming ${option}, nothing written`, () => {
			const out = join(root, `bad-${option.slice(2)}.png`);
			const r = runCli(['preview', planPath, '--png', out, ...args]);
			expect(r.status).toBe(2);
			expect(r.stderr).toContain(option);
			expect(r.stdout).toBe('');
			expect(existsSync(out)).toBe(false);
		});
	}

	it('refuses to replace an existing PNG without --force, and replaces it with --force', () => {
		const out = join(root, 'keep.png');
		writeFileSync(out, 'mine');
		const r = runCli(['preview', planPath, '--png', out, '--width', '20', '--height', '20']);
		expect(r.status).toBe(2);
		expect(r.stderr).toContain('--png');
		expect(readFileSync(out, 'utf8')).toBe('mine');
		expect(runCli(['preview', planPath, '--png', out, '--width', '20', '--height', '20', '--force']).status).toBe(0);
		expect(decode(readFileSync(out)).height).toBe(20 + 13);
	});
});

describe('evenecho simulate', () => {
	it('phantom-series, DICOM: seven images, the session file in the scanner-session format, and the truth', () => {
		const dir = join(root, 'series-dicom');
		const r = runCli(['simulate', planPath, '--out', dir, '--seed', '2']);
		expect(r.status, r.stderr).toBe(0);
		const files = readdirSync(dir).sort();
		expect(files).toEqual([
			'air.dcm',
			'g18.dcm',
			'g24.dcm',
			'g30.dcm',
			'g36.dcm',
			'g42.dcm',
			's4-max.dcm',
			'session.json',
			'truth.json',
		]);
		const session = JSON.parse(readFileSync(join(dir, 'session.json'), 'utf8'));
		expect(session.format).toBe('evenecho-scanner-session/1');
		expect(session.gainSteps).toHaveLength(5);
		expect(session.probeInAir.image).toBe('air.dcm');
		expect(session.sliderSteps[0]).toEqual({image: 's4-max.dcm', slider: 4, position: 1, masterGainDb: 30});
		expect(session.sliders.count).toBe(8);
		expect(session.pixelScale).toBeUndefined();
		for (const step of [...session.gainSteps, session.probeInAir, ...session.sliderSteps])
			expect(existsSync(join(dir, step.image))).toBe(true);
		const photometrics = new Set<string>();
		for (const f of files.filter((n) => n.endsWith('.dcm'))) {
			const ds = dicomParser.parseDicom(readFileSync(join(dir, f)));
			expect([ds.uint16('x00280011'), ds.uint16('x00280010')]).toEqual([600, 480]);
			photometrics.add(ds.string('x00280004')!);
			expect(ds.elements['x00186011']!.items).toHaveLength(1);
		}
		expect([...photometrics].sort()).toEqual(['MONOCHROME2', 'RGB']);
		const truth = JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8'));
		expect(truth.kind).toBe('phantom-series');
		expect(truth.scanner.greyMap.length).toBeGreaterThan(20);
		expect(truth.penetrationCm).toBeGreaterThan(10);
		expect(truth.penetrationCm).toBeLessThan(16);
	}, 60_000);

	it('phantom-series, PNG: a pixel scale whose top row lies above the skin (the border), grey and RGB mixed', () => {
		const dir = join(root, 'series-png');
		expect(runCli(['simulate', planPath, '--out', dir, '--format', 'png']).status).toBe(0);
		const session = JSON.parse(readFileSync(join(dir, 'session.json'), 'utf8'));
		expect(session.pixelScale.cmPerPixel).toBeCloseTo(16 / 440, 6);
		expect(session.pixelScale.topRowCm).toBeCloseTo(-24 * (16 / 440), 6);
		const channels = new Set(
			readdirSync(dir)
				.filter((n) => n.endsWith('.png'))
				.map((n) => decode(readFileSync(join(dir, n))).channels),
		);
		expect([...channels].sort()).toEqual([1, 3]);
	}, 60_000);

	it('patient: the image, the applied settings {sliders, masterGainDb} and the truth with the changed attenuation', () => {
		const dir = join(root, 'patient');
		expect(
			runCli(['simulate', planPath, '--out', dir, '--kind', 'patient', '--format', 'dicom', '--seed', '5']).status,
		).toBe(0);
		expect(readdirSync(dir).sort()).toEqual(['applied-settings.json', 'patient.dcm', 'truth.json']);
		const applied = JSON.parse(readFileSync(join(dir, 'applied-settings.json'), 'utf8'));
		expect(Object.keys(applied).sort()).toEqual(['masterGainDb', 'sliders']);
		expect(applied.sliders).toHaveLength(8);
		const truth = JSON.parse(readFileSync(join(dir, 'truth.json'), 'utf8'));
		expect(truth.layer).toBe(4);
		expect(truth.trueAlphaDbPerCmMhz).not.toBe(truth.plannedAlphaDbPerCmMhz);
		const ds = dicomParser.parseDicom(readFileSync(join(dir, 'patient.dcm')));
		expect(ds.string('x00280004')).toBe('RGB');
	}, 60_000);

	it('same seed, same bytes', () => {
		const a = join(root, 'same-a');
		const b = join(root, 'same-b');
		expect(runCli(['simulate', planPath, '--out', a, '--kind', 'patient', '--format', 'png']).status).toBe(0);
		expect(runCli(['simulate', planPath, '--out', b, '--kind', 'patient', '--format', 'png']).status).toBe(0);
		expect(readFileSync(join(a, 'patient.png')).equals(readFileSync(join(b, 'patient.png')))).toBe(true);
	}, 60_000);

	it('refuses existing files without --force: exit 2 naming --out, every file untouched', () => {
		const dir = join(root, 'series-dicom');
		const before = readFileSync(join(dir, 'g18.dcm'));
		writeFileSync(join(dir, 'truth.json'), 'mine');
		const r = runCli(['simulate', planPath, '--out', dir, '--seed', '9']);
		expect(r.status).toBe(2);
		expect(r.stderr).toContain('--out');
		expect(readFileSync(join(dir, 'g18.dcm')).equals(before)).toBe(true);
		expect(readFileSync(join(dir, 'truth.json'), 'utf8')).toBe('mine');
		expect(readdirSync(dir).filter((n) => n.startsWith('.'))).toEqual([]);
	}, 60_000);

	it('refuses an unknown --kind or --format: exit 2 naming it, no folder made', () => {
		const kind = runCli(['simulate', planPath, '--out', join(root, 'unused'), '--kind', 'nope']);
		expect(kind.status).toBe(2);
		expect(kind.stderr).toContain('--kind');
		const format = runCli(['simulate', planPath, '--out', join(root, 'unused'), '--format', 'tiff']);
		expect(format.status).toBe(2);
		expect(format.stderr).toContain('--format');
		expect(existsSync(join(root, 'unused'))).toBe(false);
	}, 60_000);

	it('refuses a missing --out and one whose parent does not exist', () => {
		const missing = runCli(['simulate', planPath]);
		expect(missing.status).toBe(2);
		expect(missing.stderr).toContain('--out');
		const deep = runCli(['simulate', planPath, '--out', join(root, 'no', 'such', 'dir')]);
		expect(deep.status).toBe(2);
		expect(deep.stderr).toContain('--out');
	}, 60_000);

	it('refuses an unwritable --out, nothing written (only where permissions apply: not as root)', () => {
		const locked = join(root, 'locked');
		mkdirSync(locked);
		chmodSync(locked, 0o500);
		const r = runCli(['simulate', planPath, '--out', locked, '--kind', 'patient']);
		chmodSync(locked, 0o700);
		if (process.getuid?.() !== 0) {
			expect(r.status).toBe(2);
			expect(r.stderr).toContain('--out');
			expect(readdirSync(locked)).toEqual([]);
		}
	}, 60_000);
});
