/**
 * `evenecho table` as a protocol writer runs it: rows agree with `evenecho curve` on the same plan,
 * output is byte-identical run to run, presets work, and every bad sweep exits 2 with a clear
 * message and nothing on standard output.
 */
import {existsSync, mkdtempSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {fileURLToPath} from 'node:url';
import {parse} from 'csv-parse/sync';
import {XMLValidator} from 'fast-xml-parser';
import {beforeAll, describe, expect, it} from 'vitest';
import {parsePlanDocument} from '../../src/plan/plan-schema.js';
import {cautionLine} from '../../src/report/cautions.js';
import {openPresetStore} from '../../src/store/preset-store.js';
import {tableJsonSchema, type TableJson} from '../../src/table/table-json.js';
import {abdomenPlanJson} from '../fixtures/plans.js';
import {runCli} from '../helpers/run-cli.js';

/** Invented scenario (no real patient, clinic or product): outpatient liver protocol, adult. */
const protocolPlan = abdomenPlanJson(
	{
		format: 'evenecho-plan/1',
		name: 'Clinic test protocol: right upper quadrant',
		display: {depthCm: 18, assumedSpeedMps: 1540},
		noiseBudgetDb: 70,
		targetDepthCm: 15,
	},
	2.5,
);

let dir: string;
let home: string;
let planPath: string;
const env = () => ({EVENECHO_HOME: home});
const write = (name: string, content: unknown) => {
	const path = join(dir, name);
	writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content, null, 2));
	return path;
};
const table = (...args: string[]) => runCli(['table', ...args], {env: env()});

beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'evenecho-table-'));
	home = mkdtempSync(join(tmpdir(), 'evenecho-table-home-'));
	planPath = write('protocol.json', protocolPlan);
});

describe('rows agree with evenecho curve', () => {
	it('each row of --format json matches `curve --format json` on the same plan written out by hand', () => {
		const r = table(planPath, '--fat', '1,6', '--freq', '2.5,5', '--receive', 'both', '--format', 'json');
		expect(r.status).toBe(0);
		const t = tableJsonSchema.parse(JSON.parse(r.stdout)) as TableJson;
		expect(t.rows).toHaveLength(8);
		for (const row of t.rows) {
			const plan = structuredClone(protocolPlan) as typeof protocolPlan & {probe: {receive?: string}};
			plan.layers[1]!.thicknessCm = row.layerCm!;
			plan.probe.centerMhz = row.centerMhz;
			plan.probe.receive = row.receive;
			const c = runCli(['curve', write(`row-${row.row}.json`, plan), '--format', 'json']);
			expect(c.status).toBe(0);
			const curve = JSON.parse(c.stdout) as {
				masterGainDb: number;
				sliders: {depthCm: number; gainDb: number}[];
				residualDb: number;
				penetrationDepthCm: number | null;
				warnings: {code: string; severity: string}[];
			};
			expect(row.masterGainDb, `row ${row.row}`).toBe(curve.masterGainDb);
			expect(row.sliders, `row ${row.row}`).toEqual(curve.sliders);
			expect(row.residualDb, `row ${row.row}`).toBe(curve.residualDb);
			expect(row.penetrationDepthCm, `row ${row.row}`).toBe(curve.penetrationDepthCm);
			expect(row.warnings.map((w) => w.code)).toEqual(
				curve.warnings.filter((w) => w.severity === 'warning').map((w) => w.code),
			);
		}
	});

	it('an --angle sweep: each row matches `curve` with that probe.angleDeg, and every format shows the angle', () => {
		const r = table(planPath, '--fat', '2', '--angle', '0,30', '--format', 'json');
		expect(r.status).toBe(0);
		const t = tableJsonSchema.parse(JSON.parse(r.stdout)) as TableJson;
		expect(t.inputs.angleDeg).toEqual([0, 30]);
		expect(t.rows.map((row) => row.angleDeg)).toEqual([0, 30]);
		for (const row of t.rows) {
			const plan = structuredClone(protocolPlan) as typeof protocolPlan & {probe: {angleDeg?: number}};
			plan.layers[1]!.thicknessCm = 2;
			plan.probe.angleDeg = row.angleDeg;
			const c = runCli(['curve', write(`angle-${row.row}.json`, plan), '--format', 'json']);
			expect(c.status).toBe(0);
			const curve = JSON.parse(c.stdout) as {masterGainDb: number; sliders: {depthCm: number; gainDb: number}[]};
			expect(row.masterGainDb, `row ${row.row}`).toBe(curve.masterGainDb);
			expect(row.sliders, `row ${row.row}`).toEqual(curve.sliders);
		}
		// Oblique paths are longer: the 30° row needs more gain somewhere.
		expect(t.rows[1]!.masterGainDb + Math.max(...t.rows[1]!.sliders.map((s) => s.gainDb))).toBeGreaterThan(
			t.rows[0]!.masterGainDb + Math.max(...t.rows[0]!.sliders.map((s) => s.gainDb)),
		);
		const csv = parse(table(planPath, '--angle', '0,30', '--format', 'csv').stdout, {columns: true}) as Record<
			string,
			string
		>[];
		expect(csv.map((row) => row['angle_deg'])).toEqual(['0', '30']);
		const md = table(planPath, '--angle', '0,30').stdout;
		expect(md.match(/\| Angle ° \|/g)).toHaveLength(1);
		const ladder = table(planPath, '--angle', '0,30', '--freq', '2.5,5').stdout;
		expect(ladder.match(/\| Angle ° \|/g)).toHaveLength(2);
		expect(md).toMatch(/Beam angle.*0, 30 ?°/);
		const svg = table(planPath, '--angle', '0,30', '--format', 'svg').stdout;
		expect(svg).toContain('at 30°');
	});

	it('the CSV cells are the same numbers', () => {
		const json = JSON.parse(table(planPath, '--fat', '1,6', '--format', 'json').stdout) as TableJson;
		const csv = parse(table(planPath, '--fat', '1,6', '--format', 'csv').stdout, {columns: true}) as Record<
			string,
			string
		>[];
		expect(csv).toHaveLength(2);
		csv.forEach((r, i) => {
			expect(Number(r['master_gain_db'])).toBe(json.rows[i]!.masterGainDb);
			expect(Number(r['slider8_db'])).toBe(json.rows[i]!.sliders[7]!.gainDb);
		});
	});
});

describe('formats and determinism', () => {
	const sweep = ['--fat', '1,2,4,6,8', '--freq', '2.5,3.5,5'];

	for (const format of ['markdown', 'csv', 'json', 'svg']) {
		it(`--format ${format} is byte-identical across runs`, () => {
			const a = table(planPath, ...sweep, '--format', format);
			const b = table(planPath, ...sweep, '--format', format);
			expect(a.status).toBe(0);
			expect(a.stderr).toBe(''); // no progress bar when piped
			expect(a.stdout.length).toBeGreaterThan(100);
			expect(b.stdout).toBe(a.stdout);
		});
	}

	it('Markdown is the default and carries the caution line, inputs and model version', () => {
		const r = table(planPath, ...sweep);
		expect(r.stdout).toMatch(/^# Depth-gain protocol table: Clinic test protocol: right upper quadrant\n/);
		expect(r.stdout).toContain(cautionLine);
		expect(r.stdout).toContain('- **Plan:** plan file protocol.json');
		expect(r.stdout).toContain('- **Model:** evenecho-model');
		expect(r.stdout).toContain('Highest frequency reaching the target, per habitus');
	});

	it('CSV is only a header row plus data rows; SVG is valid XML with the caution', () => {
		const csv = table(planPath, ...sweep, '--format', 'csv').stdout;
		expect(csv.split('\r\n').filter(Boolean)).toHaveLength(16);
		expect(csv).not.toContain('Caution');
		const svg = table(planPath, ...sweep, '--format', 'svg').stdout;
		expect(XMLValidator.validate(svg)).toBe(true);
		expect(svg).toContain('Caution: Starting point only');
	});

	it('--receive harmonic (tissue harmonic) states the harmonic model', () => {
		for (const format of ['markdown', 'json', 'svg']) {
			expect(table(planPath, '--receive', 'harmonic', '--format', format).stdout).toContain(
				'builds up along the way down',
			);
		}
	});

	it('--timestamp adds the time, otherwise none', () => {
		const r = table(planPath, '--format', 'json', '--timestamp');
		expect(JSON.parse(r.stdout).generatedAt).toMatch(/^\d{4}-\d\d-\d\dT/);
		expect(JSON.parse(table(planPath, '--format', 'json').stdout).generatedAt).toBeUndefined();
	});

	it('reads the plan from standard input with "-"', () => {
		const r = runCli(['table', '-', '--fat', '3', '--format', 'csv'], {
			input: JSON.stringify(protocolPlan),
			env: env(),
		});
		expect(r.status).toBe(0);
		expect(r.stdout.split('\r\n')[1]).toMatch(/^1,3,3\.5,fundamental,/);
	});

	it('--delta gives zero deltas on the standard habitus row', () => {
		const rows = parse(table(planPath, '--fat', '2.5,6', '--delta', '--format', 'csv').stdout, {
			columns: true,
		}) as Record<string, string>[];
		expect(rows[0]!['master_delta_db']).toBe('0');
		for (let k = 1; k <= 8; k++) expect(rows[0]![`slider${k}_delta_db`]).toBe('0');
	});
});

describe('presets', () => {
	it('--preset takes a saved preset by name, and --swap N=PRESET:M takes a layer from one', () => {
		const store = openPresetStore({home});
		const pelvis = parsePlanDocument({
			...structuredClone(protocolPlan),
			name: 'Table test pelvis',
			layers: [
				{tissue: 'skin', thicknessCm: 0.2},
				{tissue: 'fat', thicknessCm: 1.5},
				{tissue: 'urine', thicknessCm: 8},
				{tissue: 'soft-tissue', thicknessCm: 10},
			],
		});
		if (!pelvis.ok) throw new Error(pelvis.errors.join('; '));
		const saved = store.save('Table test pelvis', pelvis.value);
		const byName = table('--preset', 'Table test pelvis', '--fat', '1,3', '--format', 'json');
		expect(byName.status).toBe(0);
		const j = JSON.parse(byName.stdout) as TableJson;
		expect(j.inputs.source).toBe(`preset "${saved.id}"`);
		expect(j.rows).toHaveLength(2);

		const swapped = table(planPath, '--swap', `4=liver,${saved.id}:3`, '--format', 'json');
		expect(swapped.status).toBe(0);
		const s = JSON.parse(swapped.stdout) as TableJson;
		expect(s.rows.map((r) => r.swappedTissues[0]!.label)).toEqual(['Liver', 'Urine (full bladder)']);
		expect(s.tissues.at(-1)!.from).toBe(`layer 3 of preset "${saved.id}"`);
	});

	const templateFile = join(fileURLToPath(new URL('../..', import.meta.url)), 'presets', 'upper-abdomen.json');
	it.skipIf(!existsSync(templateFile))('--preset takes a built-in template by id', () => {
		const r = table('--preset', 'upper-abdomen', '--fat', '1,2,4,6,8', '--freq', '2.5,3.5,5', '--format', 'json');
		expect(r.status).toBe(0);
		const j = JSON.parse(r.stdout) as TableJson;
		expect(j.inputs.source).toBe('template "upper-abdomen"');
		expect(j.rows).toHaveLength(15);
	});

	it('an unknown preset, in --preset or --swap, exits 2', () => {
		const a = table('--preset', 'no-such-preset-here');
		expect(a.status).toBe(2);
		expect(a.stdout).toBe('');
		expect(a.stderr).toMatch(/no-such-preset-here/);
		const b = table(planPath, '--swap', '4=no-such-preset-here:2');
		expect(b.status).toBe(2);
		expect(b.stderr).toMatch(/--swap: no preset or template "no-such-preset-here"/);
	});
});

describe('bad sweeps: exit 2, the option and range named, nothing on stdout, no stack trace', () => {
	const cases: [string, string[], RegExp][] = [
		[
			'empty --fat',
			['--fat', ''],
			/--fat: no values given; expected a comma-separated list of numbers above 0 and up to 50 cm/,
		],
		[
			'negative --fat',
			['--fat', '2,-1'],
			/--fat: -1 is negative; every value must be a number above 0 and up to 50 cm/,
		],
		['zero --fat', ['--fat', '0,2'], /--fat: 0 is out of range; every value must be a number above 0 and up to 50 cm/],
		['--fat beyond 50 cm', ['--fat', '2,60'], /--fat: 60 is out of range/],
		['--fat not a number', ['--fat', '2,thick'], /--fat: "thick" is not a number/],
		['--fat twice', ['--fat', '2,4,2'], /--fat: 2 is listed twice/],
		[
			'--freq zero',
			['--freq', '0'],
			/--freq: 0 is out of range; every value must be a number above 0 and up to 50 MHz/,
		],
		['--freq beyond 50', ['--freq', '3.5,75'], /--freq: 75 is out of range/],
		['empty --freq', ['--freq', ','], /--freq: empty entry/],
		[
			'--angle beyond 80',
			['--angle', '0,85'],
			/--angle: 85 is out of range; every value must be a number from 0 to 80/,
		],
		['--angle negative', ['--angle', '-10'], /--angle: -10 is negative; every value must be a number from 0 to 80/],
		['--angle not a number', ['--angle', '0,steep'], /--angle: "steep" is not a number/],
		[
			'too many combinations',
			['--fat', '0.1:20:0.1', '--freq', '0.5:50:0.5', '--receive', 'both'],
			/the sweep has 40,000 combinations \(200 --fat × 100 --freq × 2 --receive\); a table holds at most 20,000 rows/,
		],
		['--layer outside the plan', ['--fat', '1', '--layer', '9'], /--layer: must be a whole number from 1 to 4/],
		['--layer on the deepest layer', ['--fat', '1', '--layer', '4'], /--fat: layer 4 is the deepest layer/],
		['--layer not a number', ['--layer', 'two'], /--layer: must be a whole layer number/],
		[
			'--receive unknown',
			['--receive', 'loud'],
			/--receive: must be fundamental, tissue-harmonic \(or harmonic\), scatterer-harmonic or both/,
		],
		['--swap unknown tissue', ['--swap', '4=marble'], /--swap: unknown tissue "marble" for layer 4/],
		['--swap malformed', ['--swap', 'liver'], /--swap: "liver" has no "="/],
		['--margin negative', ['--margin', '-3'], /--margin: must be a number from 0 to 100 dB/],
		['--ladder empty', ['--ladder', ''], /--ladder: no values given/],
		['--step out of range', ['--step', '9'], /--step: must be a number from 0.01 to 5 cm/],
		['--format unknown', ['--format', 'xlsx'], /--format: must be one of markdown, csv, json, svg/],
		[
			'--format svg with too many lines',
			['--fat', '1:17:1', '--format', 'svg'],
			/--format svg: draws one line per --fat value, at most 16 \(got 17\)/,
		],
	];
	for (const [what, args, message] of cases) {
		it(what, () => {
			const r = table(planPath, ...args);
			expect(r.status).toBe(2);
			expect(r.stdout).toBe('');
			expect(r.stderr).toMatch(message);
			expect(r.stderr).toMatch(/^evenecho: /);
			expect(r.stderr).not.toMatch(/\n\s+at /);
		});
	}

	it('a plan file and --preset together, or neither', () => {
		const both = table(planPath, '--preset', 'upper-abdomen');
		expect(both.status).toBe(2);
		expect(both.stderr).toMatch(/either a plan file or --preset, not both/);
		const neither = table('--fat', '1,2');
		expect(neither.status).toBe(2);
		expect(neither.stderr).toMatch(/give a plan file .* or --preset ID/);
		expect(neither.stdout).toBe('');
	});

	it('a bad plan file is reported as for evenecho curve', () => {
		const r = table(write('bad.json', {...protocolPlan, probe: {centerMhz: -1}}));
		expect(r.status).toBe(2);
		expect(r.stdout).toBe('');
		expect(r.stderr).toMatch(/probe\.centerMhz/);
	});
});
