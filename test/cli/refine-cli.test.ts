/**
 * `evenecho refine` as a user runs it, on simulated patient stills (PNG grey and RGB; DICOM in the
 * image tests' fixture format) of the invented upper-abdomen scenario.
 */
import {existsSync, mkdtempSync, readFileSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {encode} from 'fast-png';
import {describe, expect, it} from 'vitest';
import {computeCurve} from '../../src/engine/compensation-curve.js';
import {settingsOfFit} from '../../src/analysis/applied-gain.js';
import {abdomenPlanJson} from '../helpers/plans.js';
import {scenarioCase, scenarioFrame, scenarioPlan} from '../helpers/refine-scenario.js';
import {speckleFrame} from '../helpers/speckle-frame.js';
import {runCli} from '../helpers/run-cli.js';
import {writeDicom} from '../helpers/dicom-fixture.js';

const dir = mkdtempSync(join(tmpdir(), 'evenecho-refine-'));
const planPath = join(dir, 'plan.json');
writeFileSync(planPath, JSON.stringify(abdomenPlanJson()));
const plan = scenarioPlan();

function pngOf(grey: ArrayLike<number>, width: number, height: number, rgb = false): Uint8Array {
	const data = new Uint8Array(width * height * (rgb ? 3 : 1));
	for (let i = 0; i < width * height; i++) {
		if (rgb) data.set([grey[i]!, grey[i]!, grey[i]!], 3 * i);
		else data[i] = grey[i]!;
	}
	return encode({width, height, data, depth: 8, channels: rgb ? 3 : 1});
}

function writePng(name: string, k: number, rgb = false): string {
	const {frame} = scenarioFrame(plan, k);
	const path = join(dir, name);
	writeFileSync(path, pngOf(frame.grey, frame.width, frame.height, rgb));
	return path;
}

const scale = ['--cm-per-pixel', '0.05', '--top-cm', '0'];

describe('refine on a PNG still', () => {
	const png = writePng('case4.png', 4);

	it('JSON keeps the contract: bands, sliders, master, attenuation with its interval, warnings', () => {
		const r = runCli(['refine', png, '--plan', planPath, ...scale, '--format', 'json']);
		expect(r.stderr).toBe('');
		expect(r.status).toBe(0);
		const j = JSON.parse(r.stdout);
		expect(j.bands.length).toBe(16);
		for (const b of j.bands) {
			expect(b.depthCm).toBeGreaterThan(0);
			expect(typeof b.usable).toBe('boolean');
			expect('levelDb' in b).toBe(true);
		}
		expect(j.sliders).toHaveLength(8);
		for (const s of j.sliders) expect(Object.keys(s)).toEqual(['depthCm', 'gainDb', 'correctionDb']);
		expect(typeof j.masterGainDb).toBe('number');
		const truth = scenarioCase(4).alpha;
		expect(j.attenuation.layer).toBe(4);
		expect(j.attenuation.low).toBeLessThanOrEqual(truth);
		expect(j.attenuation.high).toBeGreaterThanOrEqual(truth);
		expect(j.warnings.map((w: {code: string}) => w.code)).toContain('uncalibrated');
		expect(j.calibrated).toBe(false);
	});

	it('text carries the cautions and says it is uncalibrated', () => {
		const r = runCli(['refine', png, '--plan', planPath, ...scale]);
		expect(r.status).toBe(0);
		expect(r.stdout).toMatch(/UNCALIBRATED/);
		expect(r.stdout).toMatch(/confirm it on the live image/);
		expect(r.stdout).toMatch(/other settings than those stated gives wrong corrections/);
		expect(r.stdout).toMatch(/Attenuation, layer 4 \(Liver\): α0 0\.\d\d dB\/cm\/MHz, 95 % interval/);
	});

	it('an RGB PNG of the same frame gives the same result', () => {
		const rgb = writePng('case4-rgb.png', 4, true);
		const a = JSON.parse(runCli(['refine', png, '--plan', planPath, ...scale, '--format', 'json']).stdout);
		const b = JSON.parse(runCli(['refine', rgb, '--plan', planPath, ...scale, '--format', 'json']).stdout);
		expect(b.attenuation.alphaDbPerCmMhz).toBeCloseTo(a.attenuation.alphaDbPerCmMhz, 2);
	});

	it('--write-plan writes the plan with the measured α0 and its interval, and refuses to replace unasked', () => {
		const out = join(dir, 'refined.json');
		const r = runCli(['refine', png, '--plan', planPath, ...scale, '--write-plan', out, '--format', 'json']);
		expect(r.status).toBe(0);
		const written = JSON.parse(readFileSync(out, 'utf8'));
		const j = JSON.parse(r.stdout);
		const liver = written.layers[3];
		expect(liver.tissue).toBe('liver');
		expect(liver.measuredAlpha.alphaDbPerCmMhz).toBeCloseTo(j.attenuation.alphaDbPerCmMhz, 3);
		expect(liver.measuredAlpha.lowDbPerCmMhz).toBeCloseTo(j.attenuation.low, 3);
		expect(liver.measuredAlpha.highDbPerCmMhz).toBeCloseTo(j.attenuation.high, 3);
		// The written plan is a valid plan whose fit equals the refined sliders.
		const curve = runCli(['curve', out, '--format', 'json']);
		expect(curve.status).toBe(0);
		JSON.parse(curve.stdout).sliders.forEach((s: {gainDb: number}, k: number) =>
			expect(s.gainDb).toBeCloseTo(j.sliders[k].gainDb, 1),
		);
		// Again, not on a terminal and without --force: refused, file untouched.
		const before = readFileSync(out, 'utf8');
		const again = runCli(['refine', png, '--plan', planPath, ...scale, '--write-plan', out]);
		expect(again.status).toBe(2);
		expect(again.stderr).toMatch(/exists; not replaced/);
		expect(readFileSync(out, 'utf8')).toBe(before);
		expect(runCli(['refine', png, '--plan', planPath, ...scale, '--write-plan', out, '--force']).status).toBe(0);
	});
});

/** The frame inside a bordered picture with burned-in marks, as scanners export it; the region says where. */
function dicomOf(k: number, options: {rgb?: boolean; deltaY?: number} = {}): string {
	const {frame} = scenarioFrame(plan, k);
	const margin = 20;
	const W = frame.width + 2 * margin;
	const H = frame.height + 2 * margin;
	const grey = new Uint8Array(W * H).fill(8);
	for (let x = 0; x < W; x += 3) grey[5 * W + x] = 235; // burned-in text line
	for (let y = 0; y < frame.height; y++)
		for (let x = 0; x < frame.width; x++) grey[(y + margin) * W + x + margin] = frame.grey[y * frame.width + x]!;
	let pixels: Uint8Array = grey;
	if (options.rgb) {
		pixels = new Uint8Array(W * H * 3);
		for (let i = 0; i < W * H; i++) pixels.set([grey[i]!, grey[i]!, grey[i]!], 3 * i);
		// A yellow caliper mark inside the measured columns: colour, so masked, not measured.
		for (let x = 0; x < 30; x++) pixels.set([230, 220, 20], 3 * ((margin + 150) * W + margin + 90 + x));
	}
	const bytes = writeDicom({
		rows: H,
		columns: W,
		photometric: options.rgb ? 'RGB' : 'MONOCHROME2',
		samples: options.rgb ? 3 : 1,
		pixels,
		regions: [
			{
				minX0: margin,
				minY0: margin,
				maxX1: margin + frame.width - 1,
				maxY1: margin + frame.height - 1,
				deltaY: options.deltaY ?? 0.05,
			},
		],
	});
	const path = join(dir, `case${k}${options.rgb ? '-rgb' : ''}${options.deltaY ? '-scaled' : ''}.dcm`);
	writeFileSync(path, bytes);
	return path;
}

describe('refine on a DICOM still with an ultrasound region', () => {
	it('MONOCHROME2 and RGB (with a colour mark in the measured columns) both hold the true α0', () => {
		const truth = scenarioCase(5).alpha;
		for (const rgb of [false, true]) {
			const r = runCli(['refine', dicomOf(5, {rgb}), '--plan', planPath, '--format', 'json']);
			expect(r.stderr).toBe('');
			const j = JSON.parse(r.stdout);
			expect(j.depthScale).toBe('the DICOM ultrasound region');
			expect(j.attenuation.low).toBeLessThanOrEqual(truth);
			expect(j.attenuation.high).toBeGreaterThanOrEqual(truth);
			expect(Math.abs(j.attenuation.alphaDbPerCmMhz - truth)).toBeLessThan(0.08);
		}
	});

	it('--frame picks one frame of a multi-frame file; a frame that is not there is refused', () => {
		const {frame} = scenarioFrame(plan, 6);
		const applied = settingsOfFit(computeCurve(plan).fit);
		const noise = speckleFrame({plan, truth: plan, applied, seed: 12, anechoic: true}).frame;
		const pixels = new Uint8Array(2 * frame.width * frame.height);
		pixels.set(noise.grey as Uint8Array, 0);
		pixels.set(frame.grey as Uint8Array, frame.width * frame.height);
		const path = join(dir, 'two-frames.dcm');
		writeFileSync(
			path,
			writeDicom({
				rows: frame.height,
				columns: frame.width,
				frames: 2,
				pixels,
				regions: [{minX0: 0, minY0: 0, maxX1: frame.width - 1, maxY1: frame.height - 1, deltaY: 0.05}],
			}),
		);
		const second = runCli(['refine', path, '--plan', planPath, '--frame', '2', '--format', 'json']);
		expect(second.stderr).toBe('');
		expect(JSON.parse(second.stdout).frame).toBe(2);
		expect(JSON.parse(second.stdout).attenuation).not.toBeNull();
		const first = runCli(['refine', path, '--plan', planPath, '--frame', '1']);
		expect(first.status).toBe(2);
		expect(first.stderr).toMatch(/no tissue/);
		const third = runCli(['refine', path, '--plan', planPath, '--frame', '3']);
		expect(third.status).toBe(2);
		expect(third.stderr).toMatch(/frame/i);
	});

	it('a region whose depth scale disagrees with the plan is refused', () => {
		const r = runCli(['refine', dicomOf(5, {deltaY: 0.04}), '--plan', planPath]);
		expect(r.status).toBe(2);
		expect(r.stderr).toMatch(/12\.8 cm of depth but the plan's display depth is 16 cm/);
	});
});

describe('stated settings', () => {
	it("--applied with the plan's own fit gives the same corrections as none", () => {
		const png = join(dir, 'case4.png');
		const fit = settingsOfFit(computeCurve(plan).fit);
		const settings = join(dir, 'settings.json');
		writeFileSync(settings, JSON.stringify({sliders: fit.slidersDb, masterGainDb: fit.masterGainDb}));
		const a = JSON.parse(runCli(['refine', png, '--plan', planPath, ...scale, '--format', 'json']).stdout);
		const b = JSON.parse(
			runCli(['refine', png, '--plan', planPath, ...scale, '--applied', settings, '--format', 'json']).stdout,
		);
		b.sliders.forEach((s: {correctionDb: number}, k: number) =>
			expect(s.correctionDb).toBeCloseTo(a.sliders[k].correctionDb, 1),
		);
		expect(b.appliedSettings.from).toBe('stated');
	});
});

describe('bad input: exit 2 naming the problem, nothing written', () => {
	const out = join(dir, 'never.json');
	const png = join(dir, 'case4.png');

	it('an image with no tissue (all anechoic)', () => {
		const applied = settingsOfFit(computeCurve(plan).fit);
		const {frame} = speckleFrame({plan, truth: plan, applied, seed: 11, anechoic: true});
		const path = join(dir, 'anechoic.png');
		writeFileSync(path, pngOf(frame.grey, frame.width, frame.height));
		const r = runCli(['refine', path, '--plan', planPath, ...scale, '--write-plan', out]);
		expect(r.status).toBe(2);
		expect(r.stderr).toMatch(/no tissue/);
		expect(r.stdout).toBe('');
		expect(existsSync(out)).toBe(false);
	});

	it('settings with the wrong slider count', () => {
		const settings = join(dir, 'six.json');
		writeFileSync(settings, JSON.stringify({sliders: [0, 0, 0, 0, 0, 0], masterGainDb: 30}));
		const r = runCli(['refine', png, '--plan', planPath, ...scale, '--applied', settings, '--write-plan', out]);
		expect(r.status).toBe(2);
		expect(r.stderr).toMatch(/sliders: has 6 values; the plan's slider bank has 8/);
		expect(existsSync(out)).toBe(false);
	});

	it('a plan whose depth differs from the image', () => {
		const other = join(dir, 'plan12.json');
		writeFileSync(other, JSON.stringify(abdomenPlanJson({display: {depthCm: 12}})));
		const r = runCli(['refine', png, '--plan', other, ...scale, '--write-plan', out]);
		expect(r.status).toBe(2);
		expect(r.stderr).toMatch(/16\.0 cm of depth but the plan's display depth is 12 cm/);
		expect(existsSync(out)).toBe(false);
	});

	it('an unreadable image', () => {
		const junk = join(dir, 'junk.dcm');
		writeFileSync(junk, 'not an image at all');
		const r = runCli(['refine', junk, '--plan', planPath, '--write-plan', out]);
		expect(r.status).toBe(2);
		expect(r.stderr).toMatch(/neither a DICOM Part 10 file .* nor a PNG/);
		expect(r.stderr).not.toMatch(/at .*\.js/);
		expect(existsSync(out)).toBe(false);
	});

	it('a PNG without a depth scale, and half a scale', () => {
		const r = runCli(['refine', png, '--plan', planPath]);
		expect(r.status).toBe(2);
		expect(runCli(['refine', png, '--plan', planPath, '--cm-per-pixel', '0.05']).stderr).toMatch(
			/--cm-per-pixel and --top-cm go together/,
		);
	});

	it('a layer number outside the plan', () => {
		const r = runCli(['refine', png, '--plan', planPath, ...scale, '--layer', '9']);
		expect(r.status).toBe(2);
		expect(r.stderr).toMatch(/--layer/);
	});
});
