/** `evenecho curve PLAN.json`: the compensation curve of one plan. */
import type {Command} from 'commander';
import {computeCurve} from '../engine/compensation-curve.js';
import {settingsDelta, settingsOf, type SettingsDelta} from '../engine/plan-difference.js';
import type {CurveResult} from '../engine/types.js';
import {curveSummary, signedDb} from '../report/curve-summary.js';
import {printable} from '../files/printable.js';
import {numberOption} from './option-values.js';
import {readMeasuredPlanFile} from './read-plan-file.js';
import {UsageError} from '../errors/usage-error.js';

const formats = ['text', 'json', 'csv'] as const;

interface Comparison {
	readonly name: string;
	readonly delta: SettingsDelta;
	readonly knotsCm: readonly number[];
}

/** Fits the second plan too and takes the differences; both must have the same slider bank. */
async function comparedWith(result: CurveResult, path: string, stepCm: number): Promise<Comparison> {
	const other = computeCurve((await readMeasuredPlanFile(path)).plan, {stepCm});
	const a = result.plan;
	const b = other.plan;
	if (
		a.sliders.count !== b.sliders.count ||
		a.display.depthCm !== b.display.depthCm ||
		a.sliders.knots !== b.sliders.knots
	) {
		throw new UsageError(
			`--against: ${printable(path)} must have the same display depth, slider count and knot ` +
				`placement (${a.display.depthCm} cm, ${a.sliders.count} sliders, ${a.sliders.knots}); it ` +
				`has ${b.display.depthCm} cm, ${b.sliders.count}, ${b.sliders.knots}`,
		);
	}
	return {
		name: b.name,
		delta: settingsDelta(settingsOf(result.fit), settingsOf(other.fit)),
		knotsCm: result.fit.sliders.map((s) => s.depthCm),
	};
}

function deltaJson(c: Comparison) {
	return {
		plan: c.name,
		masterDeltaDb: Number(c.delta.masterDeltaDb.toFixed(2)),
		sliders: c.knotsCm.map((d, k) => ({
			depthCm: Number(d.toFixed(3)),
			deltaDb: Number(c.delta.sliderDeltasDb[k]!.toFixed(2)),
			totalDeltaDb: Number(c.delta.totalDeltasDb[k]!.toFixed(2)),
		})),
	};
}

function deltaText(c: Comparison): string {
	const lines = [
		'',
		`Against ${c.name}: master ${signedDb(c.delta.masterDeltaDb)} dB`,
		'  slider  depth cm  slider change dB  total change dB',
	];
	c.knotsCm.forEach((d, k) => {
		lines.push(
			`  ${String(k + 1).padStart(6)}  ${d.toFixed(1).padStart(8)}  ` +
				`${signedDb(c.delta.sliderDeltasDb[k]!).padStart(16)}  ` +
				`${signedDb(c.delta.totalDeltasDb[k]!).padStart(15)}`,
		);
	});
	return lines.join('\n') + '\n';
}

export function registerCurveCommand(program: Command): void {
	program
		.command('curve')
		.description('compute the depth-gain curve and slider starting points of a plan file ("-" reads standard input)')
		.argument('<plan>', 'plan file (JSON, format evenecho-plan/1) or - for standard input')
		.option('--format <format>', 'text, json or csv', 'text')
		.option('--step <cm>', 'sample spacing in displayed depth, cm (0.01 to 5)', '0.1')
		.option(
			'--against <plan>',
			"a second plan (e.g. the region's standard habitus): print per-slider differences from it",
		)
		.action(async (planPath: string, opts: {format: string; step: string; against?: string}) => {
			if (!(formats as readonly string[]).includes(opts.format)) {
				throw new UsageError(`--format: must be one of ${formats.join(', ')} (got "${opts.format}")`);
			}
			const stepCm = numberOption('step', opts.step, {min: 0.01, max: 5}, 'cm');
			const {plan} = await readMeasuredPlanFile(planPath);
			const result = computeCurve(plan, {stepCm});
			const against = opts.against === undefined ? undefined : await comparedWith(result, opts.against, stepCm);
			// The machine-readable forms (and the CSV library) load only when asked for.
			if (opts.format === 'json') {
				const {curveJson} = await import('../report/curve-json.js');
				process.stdout.write(
					JSON.stringify(against ? {...curveJson(result), against: deltaJson(against)} : curveJson(result), null, 2) +
						'\n',
				);
			} else if (opts.format === 'csv') {
				const {curveCsv} = await import('../report/curve-json.js');
				process.stdout.write(curveCsv(result));
			} else {
				process.stdout.write(curveSummary(result));
				if (against) process.stdout.write(deltaText(against));
			}
		});
}
