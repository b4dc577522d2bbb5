/**
 * The console's view of the preset store: starting points to list and load, and saving under a
 * name. The built-in demo is always the first starting point. Nothing here throws: store failures
 * come back as messages to show.
 */
import {demoPlan} from '../../plan/demo-plan.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {openPresetStore} from '../../store/preset-store.js';
import {PresetExistsError} from '../../store/store-errors.js';
import {demoPoint, demoPointId, type StartingPoint, type StartingPointKind} from '../state/starting-point.js';

export type SaveOutcome =
	| {readonly ok: true}
	| {readonly ok: false; readonly exists: true}
	| {readonly ok: false; readonly exists: false; readonly message: string};

export interface PresetShelf {
	list(): {readonly points: readonly StartingPoint[]; readonly problems: readonly string[]};
	load(id: string): {readonly name: string; readonly plan: PlanDocument} | undefined;
	save(name: string, plan: PlanDocument, overwrite: boolean): SaveOutcome;
	/** One-off notes from opening the store (a file created, a file skipped). */
	readonly notices: readonly string[];
}

/** The store's API as the console uses it (src/store/preset-store.ts). */
export interface StoreLike {
	list(): {
		presets: readonly {id: string; name: string; region: string; isTemplate: boolean}[];
		problems: readonly string[];
	};
	find(idOrName: string): {id: string; name: string; isTemplate: boolean; plan: PlanDocument} | undefined;
	save(name: string, plan: PlanDocument, options?: {overwrite?: boolean}): unknown;
	readonly notices: readonly string[];
}

const messageOf = (e: unknown) => (e instanceof Error ? e.message : String(e));

/** Wraps a store: demo first, then templates, then the user's presets. */
export function shelfOver(store: StoreLike | undefined, openProblem?: string): PresetShelf {
	return {
		notices: store?.notices ?? (openProblem ? [openProblem] : []),
		list() {
			if (!store) return {points: [demoPoint], problems: []};
			try {
				const {presets, problems} = store.list();
				const points = presets.map(
					(p): StartingPoint => ({
						id: p.id,
						name: p.name,
						region: p.region,
						kind: p.isTemplate ? 'template' : 'preset',
					}),
				);
				const order = (k: StartingPointKind) => (k === 'template' ? 0 : 1);
				points.sort((a, b) => order(a.kind) - order(b.kind));
				return {points: [demoPoint, ...points], problems};
			} catch (error) {
				return {points: [demoPoint], problems: [`presets could not be listed: ${messageOf(error)}`]};
			}
		},
		load(id) {
			if (id === demoPointId) return {name: demoPoint.name, plan: demoPlan()};
			try {
				const found = store?.find(id);
				return found ? {name: found.name, plan: found.plan} : undefined;
			} catch {
				return undefined;
			}
		},
		save(name, plan, overwrite) {
			if (!store) return {ok: false, exists: false, message: openProblem ?? 'the preset store is not available'};
			try {
				store.save(name, plan, {overwrite});
				return {ok: true};
			} catch (error) {
				if (error instanceof PresetExistsError) return {ok: false, exists: true};
				return {ok: false, exists: false, message: messageOf(error)};
			}
		},
	};
}

/** Opens the real store (EVENECHO_HOME or `home` decides where user presets live). */
export function openShelf(options: {home?: string} = {}): PresetShelf {
	try {
		return shelfOver(openPresetStore(options.home === undefined ? {} : {home: options.home}));
	} catch (error) {
		return shelfOver(undefined, `presets are unavailable (${messageOf(error)}); saving is off`);
	}
}
