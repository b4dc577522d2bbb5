// Tables on worker threads and written in pieces: the same rows and the same bytes as the
// single-thread, one-string path (the reference here is the project's own earlier path, which the
// format tests hold to RFC 4180 and the JSON schema).
import {describe, expect, it} from 'vitest';
import {abdomenPlan} from '../helpers/plans.js';
import {resolveSweep, type SweepSpec} from '../../src/table/sweep-spec.js';
import {buildTable, ladderKey, runSweep} from '../../src/table/sweep-runner.js';
import {isWorkersRow} from '../../src/table/sweep-worker.js';
import {tableCsv, tableCsvChunks, tableCsvParts} from '../../src/table/table-csv.js';
import {tableJsonChunks, tableJsonParts, tableJsonText} from '../../src/table/table-json.js';
import {tableMarkdown, tableMarkdownChunks} from '../../src/table/table-markdown.js';

const spec: SweepSpec = {
	fatCm: [1, 2, 4, 8],
	freqMhz: [2.5, 3.5, 5],
	receive: ['fundamental', 'tissue-harmonic'],
	swaps: [{layer: 4, choices: [{tissue: 'liver'}, {tissue: 'spleen'}]}],
	delta: true,
};

describe('tables written in pieces', () => {
	const table = buildTable(abdomenPlan(), spec);
	const options = {source: 'plan file test.json', generatedAt: '2026-01-01T00:00:00.000Z'};
	it('give the same JSON, CSV and Markdown text, byte for byte, at any piece size', () => {
		expect([...tableJsonChunks(table, options)].join('')).toBe(tableJsonText(table, options));
		expect([...tableCsvChunks(table, 5)].join('')).toBe(tableCsv(table));
		expect([...tableMarkdownChunks(table, options, 7)].join('')).toBe(tableMarkdown(table, options));
		expect([...tableCsvChunks(table)].length).toBe(2);
	});
});

describe('rows shared out to worker threads', () => {
	it('never give two workers rows of the same frequency ladder, and give every row to one worker', () => {
		const sweep = resolveSweep(abdomenPlan(), spec);
		const table = runSweep(sweep);
		for (const workers of [2, 3, 5]) {
			const keysOf = Array.from({length: workers}, () => new Set<string>());
			for (const row of table.rows) {
				const owners = Array.from({length: workers}, (_, w) => w).filter((w) =>
					isWorkersRow(sweep, row.index, w, workers),
				);
				expect(owners).toHaveLength(1);
				keysOf[owners[0]!]!.add(ladderKey(row.plan, row.targetDepthCm));
			}
			for (let a = 0; a < workers; a++) {
				for (let b = a + 1; b < workers; b++) expect([...keysOf[a]!].filter((k) => keysOf[b]!.has(k))).toEqual([]);
			}
		}
	});

	it('the built runner on two threads gives the same rows, in order, as one thread', async () => {
		// The worker file exists only in the build (dist), so the built module is the one to run.
		const built = (await import(
			new URL('../../dist/src/table/sweep-parallel.js', import.meta.url).href
		)) as typeof import('../../src/table/sweep-parallel.js');
		const sweep = resolveSweep(abdomenPlan(), spec);
		const seen: number[] = [];
		const parallel = await built.runSweepInParallel(sweep, {threads: 2, onProgress: (done) => seen.push(done)});
		const single = runSweep(sweep);
		const plain = (t: typeof single) => t.rows.map(({doc: _d, plan: _p, ...rest}) => rest);
		expect(plain(parallel)).toEqual(plain(single));
		expect(parallel.rows.map((r) => r.doc)).toEqual(single.rows.map((r) => r.doc));
		expect(seen.at(-1)).toBe(sweep.rowCount);
		expect(tableJsonText(parallel)).toBe(tableJsonText(single));
	});

	it('on three threads (whole rows on each) and on two keeping the curves, gives the same rows as one thread', async () => {
		const built = (await import(
			new URL('../../dist/src/table/sweep-parallel.js', import.meta.url).href
		)) as typeof import('../../src/table/sweep-parallel.js');
		const sweep = resolveSweep(abdomenPlan(), spec);
		const plain = (t: ReturnType<typeof runSweep>) => t.rows.map(({doc: _d, plan: _p, ...rest}) => rest);
		expect(plain(await built.runSweepInParallel(sweep, {threads: 3}))).toEqual(plain(runSweep(sweep)));
		// Two threads split each row: the worker's physics, this thread's fit (the curve comes from the physics).
		const withCurves = await built.runSweepInParallel(sweep, {threads: 2, keepCurves: true});
		expect(plain(withCurves)).toEqual(plain(runSweep(sweep, {keepCurves: true})));
		expect(withCurves.rows.every((r) => r.curve !== undefined && r.curve.depthsCm.length > 100)).toBe(true);
	});

	it('streamed on two threads, hands every row on once, in order, and writes the same JSON and CSV bytes', async () => {
		const built = (await import(
			new URL('../../dist/src/table/sweep-parallel.js', import.meta.url).href
		)) as typeof import('../../src/table/sweep-parallel.js');
		const sweep = resolveSweep(abdomenPlan(), spec);
		const single = runSweep(sweep);
		const options = {source: 'plan file test.json'};
		const frame = built.tableFrame(sweep);
		const json = tableJsonParts(frame, options);
		const csv = tableCsvParts(frame);
		let jsonText = json.head;
		let csvText = csv.head;
		const handed: number[] = [];
		await built.streamSweepInParallel(frame, {threads: 2}, (rows) => {
			handed.push(...rows.map((r) => r.index));
			jsonText += json.rows(rows);
			csvText += csv.rows(rows);
		});
		jsonText += json.end();
		csvText += csv.end();
		expect(handed).toEqual(single.rows.map((r) => r.index));
		expect(jsonText).toBe(tableJsonText(single, options));
		expect(csvText).toBe(tableCsv(single));
	});
});
