/**
 * `evenecho table [PLAN] [--preset ID] --fat … --freq …`: default compensation tables for department
 * protocols. One row of starting settings per combination of habitus (subcutaneous layer thickness),
 * probe frequency, receive mode and tissue swaps; Markdown, CSV, JSON or SVG on standard output.
 */
import {once} from 'node:events';
import {basename} from 'node:path';
import type {Command} from 'commander';
import {printable} from '../files/printable.js';
import type {PlanDocument} from '../plan/plan-schema.js';
import type {Preset, PresetStore} from '../store/preset-store.js';
import {createProgressBar} from '../table/progress-bar.js';
import {limitInlining} from '../runtime/inlining-budget.js';
import {holdYoungGeneration} from '../runtime/young-generation.js';
import {maxTableRows, resolveSweep, SweepError, type ResolvedSweep, type TissueChoice} from '../table/sweep-spec.js';
import {runSweepInParallel, streamSweepInParallel, tableFrame} from '../table/sweep-parallel.js';
import {parseSweepText, type PresetLayerLookup} from '../table/sweep-options.js';
import type {TableFormatOptions} from '../table/table-common.js';
import {tableCsvChunks, tableCsvParts} from '../table/table-csv.js';
import {tableJsonChunks, tableJsonParts} from '../table/table-json.js';
import {tableMarkdownChunks} from '../table/table-markdown.js';
import {checkSvgSweep, maxSvgLines, maxSvgPanels, tableSvg} from '../table/table-svg.js';
import {readPlanFile, scannerForPlan} from './read-plan-file.js';
import {UsageError} from '../errors/usage-error.js';

const formats = ['markdown', 'csv', 'json', 'svg'] as const;
type Format = (typeof formats)[number];

interface TableOptions {
	preset?: string;
	fat?: string;
	layer?: string;
	freq?: string;
	angle?: string;
	receive?: string;
	swap?: string[];
	delta?: boolean;
	ladder?: string;
	margin?: string;
	step?: string;
	format: string;
	timestamp?: boolean;
}

/** The preset store, loaded only when a preset is named (it brings in conf). */
async function openStore(): Promise<PresetStore> {
	const {openPresetStore} = await import('../store/preset-store.js');
	return openPresetStore();
}

function kindOf(entry: Preset): string {
	return `${entry.isTemplate ? 'template' : 'preset'} "${entry.id}"`;
}

/**
 * Writes to standard output and waits while a pipe is full, so streamed rows do not pile up in
 * memory behind a slow reader (a file takes them at once).
 */
async function written(text: string): Promise<void> {
	if (text !== '' && !process.stdout.write(text)) await once(process.stdout, 'drain');
}

function collect(value: string, previous: string[] | undefined): string[] {
	return [...(previous ?? []), value];
}

const help = `
Sweeps multiply: rows = --fat values × --freq values × --angle values × receive modes × each --swap's tissues,
at most ${maxTableRows.toLocaleString('en-US')} rows. Values out of range, negative, repeated or not numbers are refused
(exit code 2). The SVG chart draws one line per --fat value (at most ${maxSvgLines}) and one panel per
frequency / receive mode / swapped tissue (at most ${maxSvgPanels}).

Without --fat the habitus column shows the plan's own layer; without --freq the plan's own probe.
Output is deterministic: the same inputs give byte-identical output (no time stamp unless
--timestamp). A progress bar appears on a terminal (standard error) for sweeps over about 1 s.

Examples:
  evenecho table --preset upper-abdomen --fat 1,2,4,6,8 --freq 2.5,3.5,5
  evenecho table plan.json --fat 1,3,5 --receive both --delta --format csv > table.csv
  evenecho table plan.json --fat 2,6 --angle 0,20,40
  evenecho table plan.json --fat 2,6 --swap 4=liver,spleen --format svg > curves.svg`;

export function registerTableCommand(program: Command): void {
	program
		.command('table')
		.description(
			'default compensation tables for protocols: a plan or preset swept over habitus, probe ' +
				'frequency, beam angle, receive mode and tissue swaps',
		)
		.argument('[plan]', 'plan file (JSON, format evenecho-plan/1) or - for standard input; or use --preset')
		.option(
			'--preset <id>',
			'a template or saved preset instead of a plan file: the id or name "evenecho presets list" shows',
		)
		.option(
			'--fat <cm,...>',
			'thicknesses of the subcutaneous layer, cm, each above 0 and up to 50: a list (1,2,4,6,8) or from:to:step (1:8:0.5)',
		)
		.option('--layer <n>', 'the layer --fat sets, 1 = just under the skin (default: the first layer of tissue "fat")')
		.option(
			'--freq <MHz,...>',
			"probe centre frequencies, MHz, each above 0 and up to 50, as a list or from:to:step (default: the plan's)",
		)
		.option(
			'--angle <deg,...>',
			"beam angles from the layer normal, degrees, each from 0 to 80, as a list (0,15,30) or from:to:step (default: the plan's)",
		)
		.option(
			'--receive <mode>',
			'fundamental, tissue-harmonic (or harmonic), scatterer-harmonic (contrast agents) ' +
				"or both (fundamental and tissue-harmonic; default: the plan's)",
		)
		.option(
			'--swap <n=tissues>',
			'give layer n each tissue in turn: library tissue ids or PRESET:M (layer M of a preset), comma-separated; repeat for other layers',
			collect,
		)
		.option('--delta', 'show sliders and master gain as differences from the standard habitus (the plan as it is)')
		.option(
			'--ladder <MHz,...>',
			'frequencies tried for the highest-reaching column (default: the --freq list, else 1 to 15 MHz in 0.5 MHz steps)',
		)
		.option(
			'--margin <dB>',
			'for the highest-reaching column: dB the target depth must stay below the noise budget, 0 to 100 (default 0)',
		)
		.option('--step <cm>', 'sample spacing in displayed depth, cm (0.01 to 5)', '0.1')
		.option('--format <format>', 'markdown, csv, json or svg', 'markdown')
		.option('--timestamp', 'add the generation time (markdown, json, svg)')
		.addHelpText('after', help)
		.action(async (planPath: string | undefined, opts: TableOptions) => {
			if (!(formats as readonly string[]).includes(opts.format)) {
				throw new UsageError(`--format: must be one of ${formats.join(', ')} (got "${opts.format}")`);
			}
			const format = opts.format as Format;
			if (planPath !== undefined && opts.preset !== undefined)
				throw new UsageError('give either a plan file or --preset, not both');
			if (planPath === undefined && opts.preset === undefined)
				throw new UsageError('give a plan file (or - for standard input) or --preset ID (see evenecho presets list)');

			const needsStore = opts.preset !== undefined || (opts.swap ?? []).some((s) => s.includes(':'));
			const store = needsStore ? await openStore() : undefined;

			let doc: PlanDocument;
			let source: string;
			if (opts.preset !== undefined) {
				// get() explains a miss or a stored preset that no longer validates (a UsageError).
				const entry = store!.get(opts.preset);
				doc = entry.plan;
				source = kindOf(entry);
			} else {
				doc = (await readPlanFile(planPath!)).doc;
				source = planPath === '-' ? 'plan from standard input' : `plan file ${printable(basename(planPath!))}`;
			}

			const presetLayer: PresetLayerLookup | undefined = store
				? (preset, m): TissueChoice | undefined => {
						const entry = store.find(preset);
						if (!entry) return undefined;
						const layers = entry.plan.layers;
						if (m > layers.length)
							throw new SweepError(
								'swap',
								`--swap: ${kindOf(entry)} has ${layers.length} layers; M must be from 1 to ${layers.length}`,
							);
						return {tissue: layers[m - 1]!.tissue, from: `layer ${m} of ${kindOf(entry)}`};
					}
				: undefined;

			let sweep: ResolvedSweep;
			try {
				const spec = parseSweepText(
					{
						...(opts.fat !== undefined ? {fat: opts.fat} : {}),
						...(opts.layer !== undefined ? {layer: opts.layer} : {}),
						...(opts.freq !== undefined ? {freq: opts.freq} : {}),
						...(opts.angle !== undefined ? {angle: opts.angle} : {}),
						...(opts.receive !== undefined ? {receive: opts.receive} : {}),
						swap: opts.swap ?? [],
						delta: opts.delta === true,
						...(opts.ladder !== undefined ? {ladder: opts.ladder} : {}),
						...(opts.margin !== undefined ? {margin: opts.margin} : {}),
						...(opts.step !== undefined ? {step: opts.step} : {}),
					},
					presetLayer,
				);
				sweep = resolveSweep(doc, spec);
				if (format === 'svg') checkSvgSweep(sweep);
			} catch (error) {
				if (error instanceof SweepError) throw new UsageError(error.message);
				throw error;
			}
			// Before the rows' hot code is compiled, here and on the worker threads (runtime/inlining-budget.ts).
			limitInlining();
			const scanner = await scannerForPlan(doc);
			const swept = scanner ? {...sweep, scanner} : sweep;
			const fo: TableFormatOptions = {source, ...(opts.timestamp ? {generatedAt: new Date().toISOString()} : {})};
			const bar = createProgressBar(process.stderr);
			try {
				const run = {
					keepCurves: format === 'svg',
					onProgress: (done: number, total: number) => {
						bar.update(done, total);
						// This thread computes rows and writes the output: its garbage is brief (runtime/young-generation.ts).
						holdYoungGeneration();
					},
				};
				// Rows are written as they are computed, in order, and dropped: a 20,000-row table is never
				// held whole, neither as rows nor as text. Not on a terminal, where they would cross the
				// progress bar; nor Markdown (its columns fit the widest cell) or SVG (one drawing).
				if ((format === 'json' || format === 'csv') && !process.stdout.isTTY) {
					const frame = tableFrame(swept);
					const parts = format === 'json' ? tableJsonParts(frame, fo) : tableCsvParts(frame);
					await written(parts.head);
					await streamSweepInParallel(frame, run, (rows) => written(parts.rows(rows)));
					await written(parts.end());
				} else {
					const table = await runSweepInParallel(swept, run);
					bar.finish();
					const chunks =
						format === 'csv'
							? tableCsvChunks(table)
							: format === 'json'
								? tableJsonChunks(table, fo)
								: format === 'svg'
									? [tableSvg(table, fo)]
									: tableMarkdownChunks(table, fo);
					// Written a few hundred rows at a time: a 20,000-row table is never one string in memory.
					for (const chunk of chunks) process.stdout.write(chunk);
				}
			} finally {
				bar.finish();
			}
		});
}
