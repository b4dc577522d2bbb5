/**
 * Protocol-table benchmark: a 10,000-row sweep (100 habitus × 50 frequencies × 2 receive modes) of
 * an invented template, the full table path (variants, engine, ladder, rows, then each format)
 * against the engine alone on the very same plans in the same run: computeCurve for every row's
 * plan plus the frequency ladder for every distinct ladder the table needs. The ratio is the
 * table's own overhead; target ≤ 1.5×.
 */
import {performance} from 'node:perf_hooks';
import {computeCurve} from '../src/engine/compensation-curve.js';
import {frequencyLadder} from '../src/engine/frequency-ladder.js';
import type {EnginePlan} from '../src/engine/types.js';
import {parsePlanDocument, type PlanDocument} from '../src/plan/plan-schema.js';
import {buildTable, type ProtocolTable, type SweepSpec} from '../src/table/sweep.js';
import {tableCsv} from '../src/table/table-csv.js';
import {tableJsonText} from '../src/table/table-json.js';
import {tableMarkdown} from '../src/table/table-markdown.js';
import {tableSvg} from '../src/table/table-svg.js';
import {report} from './bench-tools.js';

/** Invented template: adult upper abdomen (not a real patient). */
function benchTemplate(): PlanDocument {
	const r = parsePlanDocument({
		name: 'Bench template: upper abdomen',
		region: 'upper-abdomen',
		layers: [
			{tissue: 'skin', thicknessCm: 0.2},
			{tissue: 'fat', thicknessCm: 2},
			{tissue: 'muscle', thicknessCm: 1},
			{tissue: 'liver', thicknessCm: 20},
		],
		probe: {centerMhz: 3.5, bandwidthFraction: 0.6},
		display: {depthCm: 16, assumedSpeedMps: 1540},
		noiseBudgetDb: 70,
	});
	if (!r.ok) throw new Error(r.errors.join('; '));
	return r.value;
}

const range = (from: number, step: number, count: number) => Array.from({length: count}, (_, i) => Number((from + i * step).toFixed(6)));

/** What the engine alone does for the same rows: every curve, and each distinct ladder once. */
function engineAlone(plans: readonly EnginePlan[], ladderPlans: readonly EnginePlan[], ladder: readonly number[], targetCm: number, marginDb: number): void {
	for (const p of plans) computeCurve(p, {stepCm: 0.1});
	for (const p of ladderPlans) frequencyLadder(p, ladder, targetCm, marginDb);
}

/** One plan per distinct ladder (same layers, receive and budget): the first row of each. */
function ladderRepresentatives(t: ProtocolTable): EnginePlan[] {
	const seen = new Map<string, EnginePlan>();
	for (const r of t.rows) {
		const key = JSON.stringify([r.layerCm, r.receive, r.swapLabels, r.noiseBudgetDb]);
		if (!seen.has(key)) seen.set(key, r.plan);
	}
	return [...seen.values()];
}

function time<T>(fn: () => T): {ms: number; value: T} {
	const t0 = performance.now();
	const value = fn();
	return {ms: performance.now() - t0, value};
}

export async function run(): Promise<void> {
	console.log('protocol tables');
	const doc = benchTemplate();
	const spec: SweepSpec = {fatCm: range(0.5, 0.5, 100), freqMhz: range(2, 0.2, 50), receive: ['fundamental', 'harmonic']};

	// Warm-up on a small sweep so both paths are compiled before timing.
	const warm = buildTable(doc, {fatCm: [1, 2, 3], freqMhz: [2, 3, 4, 5], receive: ['fundamental', 'harmonic']});
	engineAlone(warm.rows.map((r) => r.plan), ladderRepresentatives(warm), warm.sweep.ladderMhz, warm.sweep.targetDepthCm, 0);
	tableMarkdown(warm);
	tableCsv(warm);
	tableJsonText(warm);

	const built = time(() => buildTable(doc, spec));
	const table = built.value;
	const rows = table.rows.length;
	const plans = table.rows.map((r) => r.plan);
	const ladders = ladderRepresentatives(table);
	const engine = time(() => engineAlone(plans, ladders, table.sweep.ladderMhz, table.sweep.targetDepthCm, table.sweep.marginDb));

	const perSecond = (ms: number) => `${((rows / ms) * 1000).toFixed(0)} rows/s`;
	report(`engine alone on the same ${rows.toLocaleString('en-US')} plans (${plans.length} curves, ${ladders.length} ladders of ${table.sweep.ladderMhz.length})`, `${(engine.ms / 1000).toFixed(2)} s, ${perSecond(engine.ms)}`);
	report('table sweep (variants, engine, ladders, rows)', `${(built.ms / 1000).toFixed(2)} s, ${perSecond(built.ms)}`);
	for (const [name, format] of [
		['markdown', () => tableMarkdown(table)],
		['csv', () => tableCsv(table)],
		['json', () => tableJsonText(table)],
	] as const) {
		const f = time(format);
		const total = built.ms + f.ms;
		const ratio = total / engine.ms;
		report(
			`full table path, ${name} (${(f.value.length / 1e6).toFixed(1)} MB, formatting ${f.ms.toFixed(0)} ms)`,
			`${(total / 1000).toFixed(2)} s, ${perSecond(total)}, ${ratio.toFixed(2)}x the engine alone`,
			'<= 1.5x',
			ratio <= 1.5,
		);
	}

	// The SVG chart is capped at 16 lines × 24 panels; time the largest one.
	const chartSpec: SweepSpec = {fatCm: range(0.5, 0.5, 16), freqMhz: range(2, 0.5, 12), receive: ['fundamental', 'harmonic']};
	const chart = buildTable(doc, chartSpec, {keepCurves: true});
	const svg = time(() => tableSvg(chart));
	report(`largest SVG chart (${chart.rows.length} curves, ${(svg.value.length / 1e6).toFixed(1)} MB)`, `${svg.ms.toFixed(0)} ms to format`);
}
