/**
 * Carries out the reducer's effects (load, save, export, the fat sweep's export, exit) and turns
 * each outcome into result actions. The only UI module with I/O; failures become messages, never
 * exceptions.
 */
import type {PlanDocument} from '../../plan/plan-schema.js';
import type {Action} from '../state/console-reducer.js';
import type {Effect} from '../state/console-state.js';
import {exportToFolder, planEntries} from './export-files.js';
import type {PresetShelf} from './preset-shelf.js';
import {runScannerEffect} from './scanner-effects.js';
import {noScannerServices, type ScannerServices} from './scanner-services.js';
import {sweepEntries} from './sweep-export.js';
import {sweepTable} from '../state/sweep-table.js';
import {refineStill} from './refine-still.js';

export interface EffectContext {
	readonly shelf: PresetShelf;
	readonly doc: PlanDocument;
	readonly exit: () => void;
	/** The scanner panel's store and reader. @default none */
	readonly scanners?: ScannerServices;
	/** Runs slow work after the current frame is drawn, then dispatches what it returns. @default dropped */
	readonly later?: (work: () => Promise<Action[]>) => void;
}

const messageOf = (e: unknown) => (e instanceof Error ? e.message : String(e));

export function runEffect(effect: Effect, ctx: EffectContext): Action[] {
	switch (effect.kind) {
		case 'exit':
			ctx.exit();
			return [];
		case 'load': {
			const found = ctx.shelf.load(effect.pointId);
			if (!found) return [{type: 'failed', message: 'That starting point could not be read; the plan is unchanged.'}];
			const isPreset = ctx.shelf.list().points.some((p) => p.id === effect.pointId && p.kind === 'preset');
			return [{type: 'loaded', name: found.name, plan: found.plan, isPreset}];
		}
		case 'load-compare': {
			const found = ctx.shelf.load(effect.pointId);
			if (!found) return [{type: 'failed', message: 'That plan could not be read for the comparison.'}];
			return [{type: 'compare-loaded', index: effect.index, name: found.name, plan: found.plan}];
		}
		case 'save': {
			const plan = {...ctx.doc, name: effect.name};
			const outcome = ctx.shelf.save(effect.name, plan, effect.overwrite);
			if (outcome.ok) {
				const {points, problems} = ctx.shelf.list();
				return [
					{type: 'saved', name: effect.name},
					{type: 'starting-points', points, problems},
				];
			}
			if (outcome.exists) return [{type: 'save-exists', name: effect.name}];
			return [{type: 'failed', message: `Not saved: ${outcome.message}`}];
		}
		case 'export': {
			// The plan's files, or the fat sweep's four: one prompt, one write path.
			const {sweep} = effect;
			let entries = planEntries(ctx.doc);
			if (sweep) {
				const outcome = sweepTable(ctx.doc, sweep.fatCm, sweep.isDelta);
				if (!outcome.ok)
					return [
						{
							type: 'failed',
							message: 'Nothing exported: there is no table for this plan (the reason is under the list).',
						},
					];
				entries = sweepEntries(outcome.table);
			}
			try {
				const r = exportToFolder(entries, effect.dir, effect.replace);
				if (r.ok) return [{type: 'exported', files: r.paths}];
				if ('exists' in r) return [{type: 'export-exists', dir: r.dir, files: r.exists, ...(sweep ? {sweep} : {})}];
				return [{type: 'failed', message: r.message}];
			} catch (error) {
				return [{type: 'failed', message: `Export failed, nothing written: ${messageOf(error)}`}];
			}
		}
		case 'scanner-list':
		case 'scanner-measure':
		case 'scanner-keep':
		case 'scanner-measure-built':
			return runScannerEffect(effect, ctx.scanners ?? noScannerServices, ctx.later ?? (() => undefined));
		case 'refine':
			return [refineStill(ctx.doc, effect.path, effect.frame, effect.settings)];
	}
}
