/** `evenecho preview PLAN|-`: a simulated picture of the plan, in the terminal or as a PNG. */
import {resolve} from 'node:path';
import type {Command} from 'commander';
import {computeCurve} from '../engine/compensation-curve.js';
import {encodePng} from '../image/png-writer.js';
import {createPictureCache, type PanelKind} from '../simulate/plan-picture.js';
import {previewPicture} from '../simulate/preview-picture.js';
import {defaultDynamicRangeDb} from '../simulate/scanner-behaviour.js';
import {pictureModeFromEnv} from '../ui/picture/picture-cells.js';
import {illustrationLabel, panelChrome, panelLines, panelLegend, travelLine} from '../ui/picture/picture-panels.js';
import {dynamicRangeLimit, pixelLimit, seedLimit, wholeNumberOption, writeOutputFile} from './image-options.js';
import {numberOption} from './option-values.js';
import {resolvePlan} from '../plan/resolve-plan.js';
import {UsageError} from '../errors/usage-error.js';
import {choiceOption} from './choice-option.js';
import {readPlanFile, scannerForPlan} from './read-plan-file.js';

const panels = ['ramp', 'plan', 'both'] as const;

interface PreviewOptions {
	png?: string;
	panel: string;
	width?: string;
	height?: string;
	seed: string;
	dynamicRange: string;
	scanner?: string;
	force?: boolean;
}

/** A profile id as plans name it (the plan format's own rule). */
const profileIdPattern = /^[a-z0-9][a-z0-9-]{0,63}$/;

export function registerPreviewCommand(program: Command): void {
	program
		.command('preview')
		.description(
			"a simulated B-mode illustration of a plan: the built-in ramp alone and the plan's sliders, in the terminal or as PNG",
		)
		.argument('<plan>', 'plan file (JSON) or - for standard input')
		.option('--png <file>', 'write an 8-bit grey PNG instead of drawing in the terminal')
		.option('--panel <which>', 'ramp, plan or both', 'both')
		.option(
			'--width <px>',
			`picture width per panel, ${pixelLimit.min} to ${pixelLimit.max} px (terminal: one column per pixel)`,
		)
		.option('--height <px>', `picture height, ${pixelLimit.min} to ${pixelLimit.max} px (terminal: two pixels per row)`)
		.option('--seed <n>', 'speckle seed, a whole number; the same seed gives the same bytes', '1')
		.option(
			'--dynamic-range <db>',
			`display dynamic range, ${dynamicRangeLimit.min} to ${dynamicRangeLimit.max} dB`,
			String(defaultDynamicRangeDb),
		)
		.option(
			'--scanner <id>',
			'draw it on this measured scanner profile (evenecho scanner list) instead of the one the plan names',
		)
		.option('--force', 'replace an existing PNG')
		.action(async (planPath: string, opts: PreviewOptions) => {
			const panel = choiceOption('panel', opts.panel, panels);
			const width = opts.width === undefined ? undefined : wholeNumberOption('width', opts.width, pixelLimit, 'px');
			const height = opts.height === undefined ? undefined : wholeNumberOption('height', opts.height, pixelLimit, 'px');
			const seed = wholeNumberOption('seed', opts.seed, seedLimit, '');
			const dynamicRangeDb = numberOption('dynamic-range', opts.dynamicRange, dynamicRangeLimit, 'dB');
			if (opts.scanner !== undefined && !profileIdPattern.test(opts.scanner)) {
				throw new UsageError(
					'--scanner: must be a scanner profile id: lower-case letters, digits and hyphens, up to ' +
						`64 (evenecho scanner list) (got "${opts.scanner}")`,
				);
			}
			const read = await readPlanFile(planPath);
			// The profile the plan names (or --scanner): its measured depth gain replaces the assumed ramp.
			const doc = opts.scanner === undefined ? read.doc : {...read.doc, scanner: opts.scanner};
			const measured = await scannerForPlan(doc).catch((error: unknown) => {
				if (opts.scanner !== undefined && error instanceof UsageError)
					throw new UsageError(error.message.replace(/^scanner:/, '--scanner:'));
				throw error;
			});
			const plan = measured ? resolvePlan(doc, measured) : read.plan;
			const result = computeCurve(plan);
			const travel = travelLine(result);
			const cache = createPictureCache(seed);
			if (opts.png !== undefined) {
				const pic = previewPicture(result, cache, panel, width ?? 400, height ?? 480, dynamicRangeDb);
				const bytes = encodePng(
					{width: pic.width, height: pic.height, channels: 1, data: pic.grey},
					{Title: `evenecho preview: ${plan.name}`, Description: illustrationLabel, Software: 'evenecho'},
				);
				writeOutputFile('png', resolve(opts.png), bytes, opts.force === true);
				process.stdout.write(
					`Wrote ${opts.png} (${pic.width}×${pic.height}, ` +
						`${panel === 'both' ? 'both panels' : panel}). ${illustrationLabel}\n${travel ? `${travel}\n` : ''}`,
				);
				return;
			}
			const kinds: PanelKind[] = panel === 'both' ? ['ramp', 'plan'] : [panel];
			const mode = process.stdout.isTTY ? pictureModeFromEnv(process.env) : 'plain';
			const termColumns = process.stdout.columns || 80;
			const termRows = process.stdout.rows || 24;
			const columns =
				width ?? Math.max(8, Math.min(60, Math.floor((termColumns - 2) / kinds.length) - panelChrome - 2));
			const rows = height === undefined ? Math.max(4, Math.min(30, termRows - 6)) : Math.max(4, Math.ceil(height / 2));
			const lines = panelLines(result, cache, kinds, {pictureColumns: columns, pictureRows: rows}, mode);
			process.stdout.write(
				`${lines.join('\n')}\n${panelLegend()}\n${travel ? `${travel}\n` : ''}${illustrationLabel}\n`,
			);
		});
}
