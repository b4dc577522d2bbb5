/** `evenecho curve PLAN.json`: the compensation curve of one plan. */
import type {Command} from 'commander';
import {computeCurve} from '../engine/compensation-curve.js';
import {curveCsv, curveJson} from '../report/curve-json.js';
import {curveSummary} from '../report/curve-summary.js';
import {readPlanFile} from './read-plan-file.js';
import {UsageError} from './usage-error.js';

const formats = ['text', 'json', 'csv'] as const;

export function parseStep(value: string): number {
	const step = Number(value);
	if (!Number.isFinite(step) || step < 0.01 || step > 5) throw new UsageError(`--step: must be a number from 0.01 to 5 cm (got "${value}")`);
	return step;
}

export function registerCurveCommand(program: Command): void {
	program
		.command('curve')
		.description('compute the depth-gain curve and slider starting points of a plan file ("-" reads standard input)')
		.argument('<plan>', 'plan file (JSON, format evenecho-plan/1) or - for standard input')
		.option('--format <format>', 'text, json or csv', 'text')
		.option('--step <cm>', 'sample spacing in displayed depth, cm (0.01 to 5)', '0.1')
		.action((planPath: string, opts: {format: string; step: string}) => {
			if (!(formats as readonly string[]).includes(opts.format)) {
				throw new UsageError(`--format: must be one of ${formats.join(', ')} (got "${opts.format}")`);
			}
			const stepCm = parseStep(opts.step);
			const {plan} = readPlanFile(planPath);
			const result = computeCurve(plan, {stepCm});
			if (opts.format === 'json') process.stdout.write(JSON.stringify(curveJson(result), null, 2) + '\n');
			else if (opts.format === 'csv') process.stdout.write(curveCsv(result));
			else process.stdout.write(curveSummary(result));
		});
}
