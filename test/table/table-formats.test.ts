/**
 * The four table formats parse back: CSV with a CSV parser, JSON with its schema, SVG as XML;
 * Markdown keeps its header block and one line per row. All are byte-identical run to run.
 */
import {abdomenPlan} from '../helpers/plans.js';
import {parse} from 'csv-parse/sync';
import {XMLParser, XMLValidator} from 'fast-xml-parser';
import {describe, expect, it} from 'vitest';
import {modelVersion} from '../../src/engine/compensation-curve.js';
import type {PlanDocument} from '../../src/plan/plan-schema.js';
import {cautionLine} from '../../src/report/cautions.js';
import {resolveSweep, SweepError, type SweepSpec} from '../../src/table/sweep-spec.js';
import {buildTable} from '../../src/table/sweep-runner.js';
import {harmonicSimplification, ladderSimplification} from '../../src/engine/model-notes.js';
import {tableCsv} from '../../src/table/table-csv.js';
import {tableJson, tableJsonSchema, tableJsonText} from '../../src/table/table-json.js';
import {markdownText, tableMarkdown} from '../../src/table/table-markdown.js';
import {checkSvgSweep, tableSvg, xmlText} from '../../src/table/table-svg.js';

/** The shared test stack, with a name that needs escaping in every format. */
const template = (): PlanDocument => abdomenPlan({name: 'Test template | upper abdomen <adult> & co'});

/** A custom tissue whose label needs quoting in every format. */
const oddTissue = {
	label: 'Cyst, "simple" | <odd> & \'x\'',
	speedMps: 1550,
	densityKgM3: 1010,
	alphaDbPerCmMhz: 0.01,
	exponent: 2,
	source: 'invented test tissue',
};

const spec: SweepSpec = {
	fatCm: [1, 4, 8],
	freqMhz: [2.5, 5],
	receive: ['fundamental', 'tissue-harmonic'],
	swaps: [{layer: 4, choices: [{tissue: 'liver'}, {tissue: oddTissue, from: 'layer 2 of preset "test-pelvis"'}]}],
};
const table = buildTable(template(), spec, {keepCurves: true});
const options = {source: 'plan file test.json'};

describe('CSV', () => {
	const text = tableCsv(table);
	const records = parse(text, {relax_column_count: false}) as string[][];

	it('is one header row plus one row per combination, CRLF line ends, nothing else', () => {
		expect(records).toHaveLength(1 + table.rows.length);
		expect(text.endsWith('\r\n')).toBe(true);
		expect(text.replace(/\r\n/g, '').includes('\n')).toBe(false);
		const header = records[0]!;
		expect(header).toEqual([
			'row',
			'layer2_cm',
			'center_mhz',
			'receive',
			'layer4_tissue',
			...Array.from({length: 8}, (_, k) => `slider${k + 1}_db`),
			'master_gain_db',
			'residual_db',
			'penetration_cm',
			'highest_reaching_mhz',
			'warnings',
		]);
		for (const r of records) expect(r).toHaveLength(header.length);
	});

	it('agrees with the JSON rows value for value (same rounding), and quotes the awkward label', () => {
		const json = tableJson(table, options);
		const rows = parse(text, {columns: true}) as Record<string, string>[];
		rows.forEach((r, i) => {
			const j = json.rows[i]!;
			expect(Number(r['row'])).toBe(j.row);
			expect(Number(r['layer2_cm'])).toBe(j.layerCm);
			expect(Number(r['center_mhz'])).toBe(j.centerMhz);
			expect(r['receive']).toBe(j.receive);
			expect(r['layer4_tissue']).toBe(j.swappedTissues[0]!.label);
			j.sliders.forEach((s, k) => expect(Number(r[`slider${k + 1}_db`])).toBe(s.gainDb));
			expect(Number(r['master_gain_db'])).toBe(j.masterGainDb);
			expect(Number(r['residual_db'])).toBe(j.residualDb);
			// Nothing is left empty for a meaning: "beyond display" and "none" are written out.
			expect(r['penetration_cm'] === 'beyond display' ? null : Number(r['penetration_cm'])).toBe(j.penetrationDepthCm);
			expect(r['highest_reaching_mhz'] === 'none' ? null : Number(r['highest_reaching_mhz'])).toBe(
				j.highestReachingMhz,
			);
			expect(r['penetration_cm']).not.toBe('');
			expect(r['warnings']).toBe([...new Set(j.warnings.map((w) => w.code))].join(' '));
		});
		expect(rows.some((r) => r['layer4_tissue'] === oddTissue.label)).toBe(true);
	});

	it('with --delta the slider columns are deltas and the master delta comes before the absolute master', () => {
		const t = buildTable(template(), {fatCm: [2, 6], delta: true});
		const rows = parse(tableCsv(t), {columns: true}) as Record<string, string>[];
		expect(Object.keys(rows[0]!)).toEqual(
			expect.arrayContaining(['slider1_delta_db', 'master_delta_db', 'master_gain_db']),
		);
		expect(Object.keys(rows[0]!)).not.toContain('slider1_db');
		expect(rows[0]!['slider1_delta_db']).toBe('0');
		expect(rows[0]!['master_delta_db']).toBe('0');
	});
});

describe('JSON', () => {
	const text = tableJsonText(table, options);
	const doc = tableJsonSchema.parse(JSON.parse(text));

	it('parses with the table schema and records inputs, tissues with sources, model, caution and notes', () => {
		expect(doc.format).toBe('evenecho-table/1');
		expect(doc.model).toBe(modelVersion);
		expect(doc.caution).toBe(cautionLine);
		expect(doc.inputs).toMatchObject({
			source: 'plan file test.json',
			sweptLayer: {layer: 2, label: 'Fat (subcutaneous)', planThicknessCm: 2},
			layerCm: [1, 4, 8],
			centerMhz: [2.5, 5],
			receive: ['fundamental', 'tissue-harmonic'],
			swaps: [{layer: 4, tissues: ['Liver', oddTissue.label]}],
			ladderMhz: [2.5, 5],
			marginDb: 0,
			targetDepthCm: 16,
		});
		// The swapped layer is listed once per tissue it takes, not also with the plan's own tissue.
		expect(doc.tissues.map((t) => t.where)).toEqual([
			'layer 1',
			'layer 2',
			'layer 3',
			'layer 4 (swap)',
			'layer 4 (swap)',
		]);
		expect(doc.tissues.find((t) => t.id === 'fat')!.source).toMatch(/Breast USCT 2016 Table I/);
		expect(doc.tissues.at(-1)).toMatchObject({
			label: oddTissue.label,
			source: 'invented test tissue',
			from: 'layer 2 of preset "test-pelvis"',
		});
		expect(doc.notes).toEqual([harmonicSimplification, ladderSimplification]);
		expect(doc.rows).toHaveLength(24);
		expect(doc.generatedAt).toBeUndefined();
	});

	it('numbers are rounded to fixed decimals (gains 0.01 dB, depths and residual 0.001)', () => {
		const decimals = (x: number) => (String(x).split('.')[1] ?? '').length;
		for (const r of doc.rows) {
			for (const s of r.sliders) expect(decimals(s.gainDb)).toBeLessThanOrEqual(2);
			expect(decimals(r.masterGainDb)).toBeLessThanOrEqual(2);
			expect(decimals(r.residualDb)).toBeLessThanOrEqual(3);
			if (r.penetrationDepthCm !== null) expect(decimals(r.penetrationDepthCm)).toBeLessThanOrEqual(3);
		}
	});

	it('carries the time only when asked', () => {
		const stamped = tableJsonSchema.parse(tableJson(table, {generatedAt: '2030-01-02T03:04:05.000Z'}));
		expect(stamped.generatedAt).toBe('2030-01-02T03:04:05.000Z');
	});

	it('the schema refuses a document with a missing caution or a stray field', () => {
		const j = JSON.parse(text) as Record<string, unknown>;
		expect(tableJsonSchema.safeParse({...j, caution: undefined}).success).toBe(false);
		expect(tableJsonSchema.safeParse({...j, extra: 1}).success).toBe(false);
	});
});

describe('SVG', () => {
	const text = tableSvg(table, options);
	const parser = new XMLParser({ignoreAttributes: false, attributeNamePrefix: '@'});

	/** The small charts: one `<g>` with a frame (`rect`) per row. */
	const cells = (svg: {g: unknown}) =>
		[svg.g].flat().filter((g) => (g as Record<string, unknown>)['rect'] !== undefined) as Record<string, unknown>[];
	const textsOf = (node: unknown): string[] =>
		[node]
			.flat()
			.filter((t) => t !== undefined)
			.map((t) => String(typeof t === 'object' && t !== null ? (t as Record<string, unknown>)['#text'] : t));

	it('is well-formed XML with one small chart per row, each curve sampled down the display', () => {
		expect(XMLValidator.validate(text)).toBe(true);
		const svg = parser.parse(text).svg;
		expect(svg['@xmlns']).toBe('http://www.w3.org/2000/svg');
		const charts = cells(svg);
		expect(charts).toHaveLength(table.rows.length);
		for (const c of charts) {
			const lines = [c['polyline']].flat() as {'@points': string}[];
			// Above and (where the echo meets the floor) below the noise floor share the boundary sample.
			const points = lines.reduce((n, p) => n + p['@points'].split(' ').length, 0);
			expect(points).toBeGreaterThanOrEqual(161);
			expect(points).toBeLessThanOrEqual(162);
			for (const p of lines) for (const pt of p['@points'].split(' ')) expect(pt).toMatch(/^-?\d+\.\d,-?\d+\.\d$/);
		}
	});

	it('labels each chart directly, shows slider knots with values, the highest reaching frequency and the target', () => {
		const svg = parser.parse(text).svg;
		expect(svg.title).toBe(`Depth-gain curves: ${template().name}`);
		const charts = cells(svg);
		table.rows.forEach((r, i) => {
			const words = textsOf(charts[i]!['text']).join('\n');
			expect(words).toContain(`Fat (subcutaneous) ${r.layerCm} cm`);
			expect(words).toMatch(
				r.highestReachingMhz === null
					? /no listed MHz reaches/
					: new RegExp(`highest reaching ${r.highestReachingMhz} MHz`),
			);
			expect(words).toContain(`master ${r.masterGainDb.toFixed(1)} dB`);
			for (let k = 1; k <= 8; k++) expect(words).toMatch(new RegExp(`S${k} [+-]\\d+\\.\\d`));
			expect([charts[i]!['circle']].flat()).toHaveLength(8);
		});
		expect(text).toContain('<title>Fat (subcutaneous) 4 cm, 2.5 MHz fundamental, layer 4: Liver, row 2</title>');
		const all = textsOf(svg.text).join('\n');
		expect(all.replace(/\n/g, ' ')).toContain(cautionLine);
		expect(all.replace(/\n/g, ' ')).toContain(modelVersion);
		expect(all.replace(/\n/g, ' ')).toContain('builds up along the way down');
		expect(all).toMatch(/Breast USCT 2016/);
		expect(text).toContain('below the noise floor or a barrier');
		expect(text).toContain('target depth');
		expect(text).toContain(xmlText(oddTissue.label));
		expect(text).not.toContain(oddTissue.label);
	});

	it('draws the part below the noise floor dashed and grey, apart from the part above', () => {
		const deep = buildTable(template(), {fatCm: [1, 8], freqMhz: [9]}, {keepCurves: true});
		expect(deep.rows.every((r) => r.penetrationDepthCm !== null)).toBe(true);
		const svg = parser.parse(tableSvg(deep)).svg;
		for (const c of cells(svg)) {
			const lines = [c['polyline']].flat() as Record<string, string>[];
			expect(lines).toHaveLength(2);
			expect(lines[0]!['@stroke-dasharray']).toBeUndefined();
			expect(lines[1]!['@stroke-dasharray']).toBeDefined();
			expect(lines[1]!['title']).toMatch(/below the noise floor/);
		}
	});

	it('with --delta draws differences from the standard habitus: the plan-as-is chart is a straight zero line', () => {
		const plain = buildTable(template(), {fatCm: [2, 6]}, {keepCurves: true});
		const delta = buildTable(template(), {fatCm: [2, 6], delta: true}, {keepCurves: true});
		const a = tableSvg(plain);
		const b = tableSvg(delta);
		expect(b).not.toBe(a);
		expect(b).toContain('minus the standard habitus');
		const first = cells(parser.parse(b).svg)[0]!;
		const xs = ([first['polyline']].flat() as {'@points': string}[]).flatMap((p) =>
			p['@points'].split(' ').map((pt) => pt.split(',')[0]),
		);
		expect(new Set(xs).size).toBe(1);
		expect(textsOf(first['text']).join('\n')).toContain('Δ master +0.0 dB');
	});

	it('draws the same chart whether the curves were kept or are recomputed', () => {
		expect(tableSvg(buildTable(template(), spec), options)).toBe(text);
	});

	it('refuses a chart with more lines or panels than it can show, before the sweep runs', () => {
		const many = Array.from({length: 17}, (_, i) => i + 1);
		expect(() => checkSvgSweep(resolveSweep(template(), {fatCm: many}))).toThrow(SweepError);
		expect(() => checkSvgSweep(resolveSweep(template(), {fatCm: many}))).toThrow(/at most 16 \(got 17\)/);
		const freqs = Array.from({length: 25}, (_, i) => 1 + i / 4);
		expect(() => checkSvgSweep(resolveSweep(template(), {freqMhz: freqs}))).toThrow(/at most 24 \(got 25\)/);
		expect(() =>
			checkSvgSweep(resolveSweep(template(), {fatCm: many.slice(0, 16), freqMhz: freqs.slice(0, 24)})),
		).not.toThrow();
	});
});

describe('Markdown', () => {
	const text = tableMarkdown(table, options);
	const lines = text.split('\n');

	it('has the header block: caution, inputs, model, tissue values with sources, then the table', () => {
		expect(lines[0]).toBe(`# Depth-gain protocol table: ${markdownText(template().name)}`);
		expect(text).toContain(`> **Caution:** ${markdownText(cautionLine)}`);
		expect(text).toContain('- **Plan:** plan file test.json');
		expect(text).toContain('- **Habitus:** layer 2 (Fat (subcutaneous)) at 1, 4, 8 cm; the plan has 2 cm');
		expect(text).toContain('- **Probe:** 2.5, 5 MHz');
		expect(text).toContain(`- **Model:** ${markdownText(modelVersion)}`);
		expect(text).toContain('## Tissues used');
		expect(text).toMatch(
			/\| layer 2 \| Fat \(subcutaneous\) \| swept \| 1440 \| 911 \| 0\.6 \| 1 \| c: in-vivo breast fat via Park 2023 Table 7/,
		);
		expect(text).toContain('taken from layer 2 of preset "test-pelvis"');
		expect(text).toContain('builds up along the way down');
	});

	it('the main table has a header, an alignment row and one line per row, each with the same number of cells', () => {
		const start = lines.findIndex((l) => l.startsWith('| # |'));
		const body = lines.slice(start, start + 2 + table.rows.length);
		expect(lines[start + 2 + table.rows.length]).toBe('');
		const cells = (l: string) => l.split(/(?<!\\)\|/).length;
		for (const l of body) expect(cells(l)).toBe(cells(body[0]!));
		expect(body[0]).toContain('S1 @1.0 cm');
		// Two frequencies per habitus: the highest reaching frequency moves to a table of its own.
		expect(body[0]).not.toContain('Highest MHz');
		expect(text).toContain('## Highest frequency reaching the target, per habitus');
		expect(body[2]).toMatch(/^\| 1 \| 1\.0 \| 2\.5 \| fundamental \| Liver \| [+-]\d+\.\d \|/);
	});

	it('escapes pipes and angle brackets in labels so the table stays intact', () => {
		expect(text).toContain('Cyst, "simple" \\| &lt;odd&gt; & \'x\'');
		expect(text).toContain('Test template \\| upper abdomen &lt;adult&gt; & co');
	});

	it('with a swapped layer above the swept one, names the swept layer and each thickness by layer, not by list position', () => {
		const swappedAbove = buildTable(template(), {
			fatCm: [1, 3],
			swaps: [{layer: 1, choices: [{tissue: 'skin'}, {tissue: 'fat'}]}],
		});
		const md = tableMarkdown(swappedAbove, options);
		expect(md).toContain('| # | Fat (subcutaneous) cm |');
		expect(md).toMatch(/\| layer 2 \| Fat \(subcutaneous\) \| swept \|/);
		expect(md).toMatch(/\| layer 3 \| Skeletal muscle \(across fibres\) \| 1 \|/);
		expect(md).toMatch(/\| layer 4 \| Liver \| rest \|/);
		expect(md).toMatch(/\| layer 1 \(swap\) \| Skin \(dermis\) \| as the layer \|/);
		expect(tableJson(swappedAbove, options).inputs.sweptLayer).toMatchObject({layer: 2, label: 'Fat (subcutaneous)'});
	});

	it('explains the warning codes it uses', () => {
		for (const code of new Set(table.rows.flatMap((r) => r.warnings.map((w) => w.code))))
			expect(text).toContain(`- \`${code}\`: `);
	});
});

describe('determinism', () => {
	it('the same inputs give byte-identical output in every format', () => {
		const again = buildTable(template(), spec, {keepCurves: true});
		expect(tableCsv(again)).toBe(tableCsv(table));
		expect(tableJsonText(again, options)).toBe(tableJsonText(table, options));
		expect(tableMarkdown(again, options)).toBe(tableMarkdown(table, options));
		expect(tableSvg(again, options)).toBe(tableSvg(table, options));
	});

	it('no output carries a time unless asked', () => {
		for (const out of [
			tableCsv(table),
			tableJsonText(table, options),
			tableMarkdown(table, options),
			tableSvg(table, options),
		]) {
			expect(out).not.toMatch(/\d{4}-\d\d-\d\dT\d\d:\d\d/);
		}
		expect(tableMarkdown(table, {generatedAt: '2030-01-02T03:04:05.000Z'})).toContain(
			'- **Generated:** 2030-01-02T03:04:05.000Z',
		);
	});
});
