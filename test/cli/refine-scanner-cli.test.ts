/**
 * `evenecho refine --scanner ID` as a user runs it: a scanner profile made through the public path
 * (`simulate` writes the invented phantom series, `scanner calibrate` stores it in a temporary
 * EVENECHO_HOME), a demo patient still with a cyst and a bright line (`simulate --kind patient`), then
 * `refine` reading it through the profile. The patient is invented: a standard adult upper abdomen
 * with a thin wall whose liver attenuates 0.8 dB/cm/MHz against the plan's 0.5; the simulator's truth
 * file says so. Tolerance 0.08 dB/cm/MHz: the refinement issue's acceptance figure.
 */
import {existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {afterAll, describe, expect, it} from 'vitest';
import {abdomenPlanJson} from '../helpers/plans.js';
import {runCli} from '../helpers/run-cli.js';

const dir = mkdtempSync(join(tmpdir(), 'evenecho-refine-scanner-'));
afterAll(() => rmSync(dir, {recursive: true, force: true}));
const env = {EVENECHO_HOME: join(dir, 'home')};
const run = (args: readonly string[]) => runCli(args, {env});

const planJson = abdomenPlanJson({}, 0.5);
const planPath = join(dir, 'plan.json');
writeFileSync(planPath, JSON.stringify(planJson));
const namingPlan = join(dir, 'plan-naming-cart.json');
writeFileSync(namingPlan, JSON.stringify({...planJson, scanner: 'ward-cart'}));

describe('refine through a stored scanner profile', () => {
	const made = run(['simulate', planPath, '--out', join(dir, 'phantom'), '--kind', 'phantom-series', '--seed', '3']);
	const calibrated = run(['scanner', 'calibrate', join(dir, 'phantom', 'session.json'), '--name', 'Ward cart']);
	const patient = run([
		'simulate',
		planPath,
		'--out',
		join(dir, 'patient'),
		'--kind',
		'patient',
		'--cyst',
		'--bright-line',
		'--seed',
		'11',
	]);
	const image = join(dir, 'patient', 'patient.dcm');
	const applied = join(dir, 'patient', 'applied-settings.json');
	const truth = JSON.parse(readFileSync(join(dir, 'patient', 'truth.json'), 'utf8'));
	const byOption = run([
		'refine',
		image,
		'--plan',
		planPath,
		'--scanner',
		'ward-cart',
		'--applied',
		applied,
		'--format',
		'json',
	]);

	it('the demo set is made through the public commands, the structures recorded in the truth', () => {
		expect(made.status, made.stderr).toBe(0);
		expect(calibrated.status, calibrated.stderr).toBe(0);
		expect(patient.status, patient.stderr).toBe(0);
		expect(truth.structures.cyst.radiusCm).toBeGreaterThan(0);
		expect(truth.structures.brightLine.depthCm).toBeGreaterThan(0);
	});

	it("--scanner: calibrated, the liver's α0 within 0.08 of the truth and inside its interval, changes in travel", () => {
		expect(byOption.status, byOption.stderr).toBe(0);
		const j = JSON.parse(byOption.stdout);
		expect(j.calibrated).toBe(true);
		expect(j.levelMap).toContain('ward-cart');
		expect(Math.abs(j.attenuation.alphaDbPerCmMhz - truth.trueAlphaDbPerCmMhz)).toBeLessThan(0.08);
		expect(j.attenuation.low).toBeLessThanOrEqual(truth.trueAlphaDbPerCmMhz);
		expect(j.attenuation.high).toBeGreaterThanOrEqual(truth.trueAlphaDbPerCmMhz);
		for (const s of j.sliders) expect(typeof s.correctionTravel).toBe('number');
		expect(j.warnings.map((w: {code: string}) => w.code)).toContain('scanner-profile');
		expect(j.warnings.map((w: {code: string}) => w.code)).not.toContain('uncalibrated');
		const text = run(['refine', image, '--plan', planPath, '--scanner', 'ward-cart', '--applied', applied]);
		expect(text.stdout).toContain('Calibrated');
		expect(text.stdout).toMatch(/of travel/);
	});

	it('a plan that names the profile in its "scanner" field gives the same result without --scanner', () => {
		const byPlan = run(['refine', image, '--plan', namingPlan, '--applied', applied, '--format', 'json']);
		expect(byPlan.status, byPlan.stderr).toBe(0);
		const a = JSON.parse(byOption.stdout);
		const b = JSON.parse(byPlan.stdout);
		expect(b.attenuation).toEqual(a.attenuation);
		expect(b.sliders).toEqual(a.sliders);
	});

	it('an unknown profile is refused with exit 2, naming it, and nothing is written', () => {
		const out = join(dir, 'never.json');
		const r = run([
			'refine',
			image,
			'--plan',
			planPath,
			'--scanner',
			'no-such-cart',
			'--applied',
			applied,
			'--write-plan',
			out,
		]);
		expect(r.status).toBe(2);
		expect(r.stderr).toContain('--scanner');
		expect(r.stderr).toContain('no-such-cart');
		expect(r.stderr).not.toMatch(/\n\s+at /);
		expect(existsSync(out)).toBe(false);
		const missing = join(dir, 'plan-naming-missing.json');
		writeFileSync(missing, JSON.stringify({...planJson, scanner: 'gone-cart'}));
		const p = run(['refine', image, '--plan', missing, '--applied', applied]);
		expect(p.status).toBe(2);
		expect(p.stderr).toContain('gone-cart');
	});
});
