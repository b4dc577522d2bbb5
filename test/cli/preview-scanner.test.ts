/**
 * `evenecho preview` on a plan that names a measured scanner profile (or `--scanner ID`): the
 * sliders-centred panel is drawn with the measured depth gain instead of the assumed ramp, and the
 * sliders are labelled as a fraction of the measured travel.
 *
 * Outside check: the phantom session is simulated with a known depth response (the invented
 * scanner of test/helpers/phantom-speckle.ts: 2.4 dB/cm plus a 6 dB hump at 6 cm). Both pictures
 * share one speckle seed and the plain display is logarithmic (255 grey levels over the dynamic
 * range), so row by row the grey difference between the measured and the assumed panel, times
 * range/255, is the measured response minus the assumed ramp (0.5 dB/cm/MHz · 2 · f0 · d, common
 * practice, no source). It must match the known truth within 1.5 dB, the tolerance for a
 * recovered depth response.
 */
import {mkdtempSync, readFileSync, rmSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {decode} from 'fast-png';
import {afterAll, beforeAll, describe, expect, it} from 'vitest';
import {trueDepthResponseDb} from '../helpers/phantom-speckle.js';
import {writeSession} from '../helpers/phantom-session.js';
import {runCli} from '../helpers/run-cli.js';

const root = mkdtempSync(join(tmpdir(), 'evenecho-preview-scanner-'));
const home = join(root, 'home');
afterAll(() => rmSync(root, {recursive: true, force: true}));
const env = {EVENECHO_HOME: home};

const plan = (scanner?: string) => ({
	format: 'evenecho-plan/2',
	name: 'Invented patient, uniform liver',
	layers: [{tissue: 'liver', thicknessCm: 30}],
	probe: {centerMhz: 3.5, bandwidthFraction: 0.6},
	display: {depthCm: 16},
	...(scanner ? {scanner} : {}),
});

let id = '';
let shallowestCm = 0;
let travelDb = 0;
beforeAll(() => {
	const session = writeSession(join(root, 'series'), 'dicom', {seed: 3, width: 200, height: 200});
	const r = runCli(['scanner', 'calibrate', session.sessionPath, '--name', 'Cart B', '--format', 'json'], {env});
	expect(r.status, r.stderr).toBe(0);
	const profile = JSON.parse(r.stdout) as {id: string; depthResponse: {depthCm: number}[]; sliderTravelDb: number};
	id = profile.id;
	shallowestCm = profile.depthResponse[0]!.depthCm;
	travelDb = profile.sliderTravelDb;
	writeFileSync(join(root, 'assumed.json'), JSON.stringify(plan()));
	writeFileSync(join(root, 'measured.json'), JSON.stringify(plan(id)));
}, 120_000);

/** Per row, the median grey difference between two same-seed panels, in dB of the 60 dB display. */
function rowDifferenceDb(a: ArrayLike<number>, b: ArrayLike<number>, width: number, row: number): number {
	const d: number[] = [];
	for (let x = 0; x < width; x++) {
		const ga = a[row * width + x]!;
		const gb = b[row * width + x]!;
		if (ga > 0 && ga < 255 && gb > 0 && gb < 255) d.push(gb - ga);
	}
	d.sort((p, q) => p - q);
	return (d[Math.floor(d.length / 2)]! * 60) / 255;
}

describe('preview with a measured scanner', () => {
	it('draws the sliders-centred panel with the measured depth gain (truth within 1.5 dB) and labels the travel', () => {
		const width = 120;
		const height = 160;
		const draw = (planFile: string, out: string) => {
			const r = runCli(
				[
					'preview',
					join(root, planFile),
					'--png',
					join(root, out),
					'--panel',
					'ramp',
					'--width',
					`${width}`,
					'--height',
					`${height}`,
					'--seed',
					'4',
				],
				{env},
			);
			expect(r.status, r.stderr).toBe(0);
			return r;
		};
		draw('assumed.json', 'assumed.png');
		const measured = draw('measured.json', 'measured.png');
		expect(measured.stdout).toMatch(
			/sliders as a fraction of travel \(full travel \d+\.\d dB, measured\): 1 [+−]?\d\.\d\d/,
		);
		const a = decode(readFileSync(join(root, 'assumed.png'))).data;
		const b = decode(readFileSync(join(root, 'measured.png'))).data;
		let worst = 0;
		for (let depth = 1.5; depth <= 8; depth += 0.5) {
			const row = Math.round((depth / 16) * height - 0.5);
			const centre = ((row + 0.5) * 16) / height;
			const expected = trueDepthResponseDb(centre) - trueDepthResponseDb(shallowestCm) - 0.5 * 2 * 3.5 * centre;
			worst = Math.max(worst, Math.abs(rowDifferenceDb(a, b, width, row) - expected));
		}
		expect(worst).toBeLessThan(1.5);
		expect(travelDb).toBeGreaterThan(0);
	}, 120_000);

	it('titles the terminal panel by what it shows; --scanner draws an unnamed plan on a profile', () => {
		const r = runCli(['preview', join(root, 'assumed.json'), '--width', '30', '--height', '40', '--scanner', id], {
			env,
		});
		expect(r.status, r.stderr).toBe(0);
		expect(r.stdout).toContain('measured gain only');
		expect(r.stdout).not.toContain('built-in ramp only');
		expect(r.stdout).toContain('sliders as a fraction of travel');
		const plain = runCli(['preview', join(root, 'assumed.json'), '--width', '30', '--height', '40'], {env});
		expect(plain.stdout).toContain('built-in ramp only');
		expect(plain.stdout).not.toContain('fraction of travel');
	}, 60_000);

	for (const [args, field] of [
		[['--scanner', 'No Such!'], '--scanner'],
		[['--scanner', 'cart-z'], '--scanner'],
	] as const) {
		it(`refuses ${args.join(' ')}: exit 2 naming ${field}`, () => {
			const r = runCli(['preview', join(root, 'assumed.json'), ...args], {env});
			expect(r.status).toBe(2);
			expect(r.stderr).toContain(field);
			expect(r.stderr).not.toMatch(/\n\s+at /);
		}, 60_000);
	}

	it('a plan naming a profile that is not stored: exit 2 naming scanner', () => {
		writeFileSync(join(root, 'missing.json'), JSON.stringify(plan('cart-z')));
		const r = runCli(['preview', join(root, 'missing.json')], {env});
		expect(r.status).toBe(2);
		expect(r.stderr).toContain('scanner: no scanner profile "cart-z"');
	}, 60_000);
});
