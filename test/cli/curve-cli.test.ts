/** `evenecho curve` used as other tools and users would: formats, stdin, and every bad-input class. */
import {mkdtempSync, writeFileSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {parse} from 'csv-parse/sync';
import {beforeAll, describe, expect, it} from 'vitest';
import {demoPlanJson} from '../../src/plan/demo-plan.js';
import {runCli} from '../helpers/run-cli.js';

let dir: string;
const planFile = (name: string, content: unknown) => {
	const path = join(dir, name);
	writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
	return path;
};
const demo = () => structuredClone(demoPlanJson) as unknown as Record<string, any>;

beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'evenecho-curve-'));
});

describe('evenecho curve', () => {
	it('prints a readable summary with sliders, master gain, penetration, warnings and cautions', () => {
		const r = runCli(['curve', planFile('demo.json', demo())]);
		expect(r.status).toBe(0);
		expect(r.stdout).toContain('master gain');
		expect(r.stdout).toMatch(/slider +depth cm/);
		expect(r.stdout).toContain('noise floor');
		expect(r.stdout).toContain('ALARA');
		expect(r.stdout).toContain('not a diagnosis');
	});

	it('--format json has the documented fields', () => {
		const r = runCli(['curve', planFile('demo.json', demo()), '--format', 'json']);
		expect(r.status).toBe(0);
		const j = JSON.parse(r.stdout);
		expect(Object.keys(j.samples[0])).toEqual(
			expect.arrayContaining([
				'displayedDepthCm',
				'trueDepthCm',
				'attenuationDb',
				'interfaceLossDb',
				'compensationDb',
				'lowDb',
				'highDb',
				'echoCenterMhz',
			]),
		);
		expect(j.samples).toHaveLength(161);
		expect(j.sliders).toHaveLength(8);
		expect(j.sliders[0]).toEqual({depthCm: 1, gainDb: expect.any(Number)});
		for (const key of ['masterGainDb', 'residualDb', 'penetrationDepthCm', 'warnings']) expect(j).toHaveProperty(key);
	});

	it('--step sets the spacing and --format csv gives one header row plus one row per sample', () => {
		const r = runCli(['curve', planFile('demo.json', demo()), '--format', 'csv', '--step', '0.5']);
		expect(r.status).toBe(0);
		const rows = parse(r.stdout, {columns: true}) as Record<string, string>[];
		expect(rows).toHaveLength(33);
		expect(Number(rows[2]!['displayedDepthCm'])).toBe(1);
	});

	it('reads the plan from standard input with "-"', () => {
		const r = runCli(['curve', '-', '--format', 'json'], {input: JSON.stringify(demo())});
		expect(r.status).toBe(0);
		expect(JSON.parse(r.stdout).plan).toBe(demoPlanJson.name);
	});

	it('needs only layers and probe.centerMhz', () => {
		const r = runCli(['curve', '-', '--format', 'json'], {
			input: JSON.stringify({layers: [{tissue: 'liver', thicknessCm: 10}], probe: {centerMhz: 3.5}}),
		});
		expect(r.status).toBe(0);
	});
});

describe('bad input: exit 2, the field named, nothing on stdout', () => {
	const cases: [string, (p: Record<string, any>) => unknown, RegExp][] = [
		[
			'negative thickness',
			(p) => ((p.layers[1].thicknessCm = -2), p),
			/layers\.1\.thicknessCm: must be a number above 0 and up to 50 cm/,
		],
		['0 MHz', (p) => ((p.probe.centerMhz = 0), p), /probe\.centerMhz: .*above 0 and up to 50 MHz/],
		['over 50 MHz', (p) => ((p.probe.centerMhz = 60), p), /probe\.centerMhz/],
		[
			'bandwidth outside 0–1.5',
			(p) => ((p.probe.bandwidthFraction = 2), p),
			/probe\.bandwidthFraction: must be a number from 0 to 1\.5/,
		],
		[
			'more than 40 layers',
			(p) => ((p.layers = Array.from({length: 41}, () => ({tissue: 'fat', thicknessCm: 1}))), p),
			/layers: must be a list of 1 to 40 layers/,
		],
		['no layers', (p) => ((p.layers = []), p), /layers: must be a list of 1 to 40 layers/],
		[
			'depth over 40 cm',
			(p) => ((p.display.depthCm = 41), p),
			/display\.depthCm: must be a number above 0 and up to 40 cm/,
		],
		['unknown key', (p) => ((p.colour = 'blue'), p), /\(plan\): unknown field "colour"/],
		['unknown nested key', (p) => ((p.probe.focusCm = 6), p), /probe: unknown field "focusCm"/],
		['wrong type', (p) => ((p.probe.centerMhz = '3.5'), p), /probe\.centerMhz: must be a number/],
		[
			'unknown tissue id',
			(p) => ((p.layers[1].tissue = 'blubber'), p),
			/layers\.1\.tissue: .*unknown tissue id "blubber"/,
		],
		['custom tissue missing a value', (p) => (delete p.layers[0].tissue.exponent, p), /layers\.0\.tissue/],
		[
			'slider range inverted',
			(p) => ((p.sliders.minDb = 10), (p.sliders.maxDb = -10), p),
			/sliders\.maxDb: minDb must be below maxDb/,
		],
		[
			'fractional slider count',
			(p) => ((p.sliders.count = 7.5), p),
			/sliders\.count: must be a whole number from 1 to 16/,
		],
		[
			'noise budget and phantom both',
			(p) => ((p.phantomCalibration = {centerMhz: 3.5, depthCm: 16, alphaDbPerCmMhz: 0.5}), p),
			/phantomCalibration: give either/,
		],
		[
			'wrong format version',
			(p) => ((p.format = 'evenecho-plan/9'), p),
			/format: must be "evenecho-plan\/2" \(or "evenecho-plan\/1", read and migrated\)/,
		],
		['not an object', () => [1, 2, 3], /\(plan\): must be a JSON object/],
	];
	for (const [what, mutate, message] of cases) {
		it(what, () => {
			const r = runCli(['curve', planFile(`${what.replace(/\W+/g, '-')}.json`, mutate(demo()))]);
			expect(r.status).toBe(2);
			expect(r.stdout).toBe('');
			expect(r.stderr).toMatch(message);
			expect(r.stderr).not.toMatch(/\n\s+at /); // no stack trace
		});
	}

	it('not JSON', () => {
		const r = runCli(['curve', planFile('broken.json', '{"layers": [')]);
		expect(r.status).toBe(2);
		expect(r.stdout).toBe('');
		expect(r.stderr).toMatch(/broken\.json: not valid JSON/);
	});

	it('missing file', () => {
		const r = runCli(['curve', join(dir, 'nope.json')]);
		expect(r.status).toBe(2);
		expect(r.stderr).toMatch(/nope\.json: no such file/);
	});

	it('bad --format and --step', () => {
		const path = planFile('ok.json', demo());
		const f = runCli(['curve', path, '--format', 'xml']);
		expect(f.status).toBe(2);
		expect(f.stderr).toMatch(/--format: must be one of text, json, csv/);
		const s = runCli(['curve', path, '--step', '0']);
		expect(s.status).toBe(2);
		expect(s.stderr).toMatch(/--step: must be a number from 0.01 to 5 cm/);
		expect(s.stdout).toBe('');
	});

	it('unknown option or command', () => {
		const r = runCli(['curve', planFile('ok2.json', demo()), '--colour']);
		expect(r.status).toBe(2);
		expect(r.stdout).toBe('');
	});
});

describe('traceability', () => {
	it("JSON and text name every layer's tissue values and their sources", () => {
		const path = planFile('trace.json', demo());
		const j = JSON.parse(runCli(['curve', path, '--format', 'json']).stdout);
		expect(j.layers).toHaveLength(4);
		expect(j.layers[1]).toMatchObject({layer: 2, tissueId: 'fat', speedMps: 1440, alphaDbPerCmMhz: 0.6, exponent: 1});
		expect(j.layers[1].source).toMatch(/Hasgall 2018/);
		expect(j.layers[3].thicknessCm).toBeNull();
		expect(j.model).toMatch(/evenecho-model/);
		const text = runCli(['curve', path]).stdout;
		expect(text).toContain('Tissue values from');
		expect(text).toMatch(/2 Fat \(subcutaneous\): c: in-vivo breast fat/);
	});
});

describe('harmonic receive', () => {
	it("an older plan's harmonic flag becomes tissue-harmonic receive, and the curve states the model in text and JSON", () => {
		const p = demo();
		(p as {probe: unknown}).probe = {centerMhz: 2.5, bandwidthFraction: 0.6, harmonic: true};
		const path = planFile('harmonic.json', p);
		expect(runCli(['curve', path]).stdout).toContain('builds up along the way down');
		const w = JSON.parse(runCli(['curve', path, '--format', 'json']).stdout).warnings.find(
			(x: {code: string}) => x.code === 'harmonic-simplified',
		);
		expect(w).toMatchObject({severity: 'note', message: expect.stringMatching(/Cobb 1983/)});
	});
});
