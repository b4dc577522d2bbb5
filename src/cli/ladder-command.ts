/** `evenecho ladder PLAN.json`: penetration per probe frequency, and the highest that reaches the target. */
import type {Command} from 'commander';
import {frequencyLadder, ladderSearchCm} from '../engine/frequency-ladder.js';
import {limits, targetDepthLimit} from '../plan/plan-schema.js';
import {targetDepthOf} from '../plan/plan-target.js';
import {cautionLine} from '../report/cautions.js';
import {ladderSimplification, receiveModeNote} from '../engine/model-notes.js';
import {numberListOption, numberOption} from './option-values.js';
import {readMeasuredPlanFile} from './read-plan-file.js';
import {UsageError} from '../errors/usage-error.js';

export function registerLadderCommand(program: Command): void {
	program
		.command('ladder')
		.description('penetration at each probe frequency and the highest frequency that reaches the target depth')
		.argument('<plan>', 'plan file (JSON) or - for standard input')
		.option('--freqs <list>', 'frequencies in MHz: "2,3.5,5" or from:to:step', '1:15:0.5')
		.option(
			'--target <cm>',
			"displayed depth that must be reached, up to the plan's display depth (default: the plan's target, else its display depth)",
		)
		.option('--margin <dB>', 'dB that must be left above the noise floor at the target', '0')
		.option('--format <format>', 'text or json', 'text')
		.action(async (planPath: string, opts: {freqs: string; target?: string; margin: string; format: string}) => {
			if (!['text', 'json'].includes(opts.format))
				throw new UsageError(`--format: must be text or json (got "${opts.format}")`);
			const freqs = numberListOption('freqs', opts.freqs, limits.centerMhz, 'MHz', 200);
			const margin = numberOption('margin', opts.margin, {min: 0, max: 100}, 'dB');
			const {doc, plan} = await readMeasuredPlanFile(planPath);
			// The same rule as a plan's own targetDepthCm: within the display depth.
			const target =
				opts.target === undefined
					? undefined
					: numberOption(
							'target',
							opts.target,
							targetDepthLimit(plan.display.depthCm),
							"cm (the plan's display depth)",
						);
			const targetCm = target ?? targetDepthOf(doc, plan);
			const ladder = frequencyLadder(plan, freqs, targetCm, margin);
			if (opts.format === 'json') {
				process.stdout.write(
					JSON.stringify(
						{
							plan: plan.name,
							noiseBudgetDb: Number(plan.noiseBudgetDb.toFixed(3)),
							targetDepthCm: targetCm,
							marginDb: margin,
							highestReachingMhz: ladder.highestReachingMhz,
							rungs: ladder.rungs.map((r) => ({
								...r,
								penetrationDepthCm: r.penetrationDepthCm === null ? null : Number(r.penetrationDepthCm.toFixed(3)),
							})),
							notes: [
								ladderSimplification,
								...(receiveModeNote(plan.probe.receive) ? [receiveModeNote(plan.probe.receive)!] : []),
							],
							caution: cautionLine,
						},
						null,
						2,
					) + '\n',
				);
				return;
			}
			const lines = [
				`Frequency ladder for ${plan.name}: target ${Number(targetCm.toFixed(2))} cm with ` +
					`${margin} dB to spare (noise budget ${plan.noiseBudgetDb.toFixed(1)} dB, same at every ` +
					'frequency)',
				'  MHz   reaches cm   target',
			];
			for (const r of ladder.rungs) {
				const reach = r.penetrationDepthCm === null ? `>${ladderSearchCm}` : r.penetrationDepthCm.toFixed(1);
				lines.push(
					`  ${r.centerMhz.toFixed(2).padStart(5)}  ${reach.padStart(10)}   ${r.reachesTarget ? 'yes' : 'no'}`,
				);
			}
			lines.push(
				ladder.highestReachingMhz === null
					? '  no frequency in the list reaches the target'
					: `  highest frequency that reaches it: ${ladder.highestReachingMhz} MHz`,
			);
			lines.push(`  ${ladderSimplification}`);
			const modeNote = receiveModeNote(plan.probe.receive);
			if (modeNote) lines.push(`  ${modeNote}`);
			lines.push(`  ${cautionLine}`);
			process.stdout.write(lines.join('\n') + '\n');
		});
}
