/**
 * The exchange files of `presets export` / `presets import`.
 *
 * An import file is either one plan document (format `evenecho-plan/1`, its `name` becomes the
 * preset's name) or a bundle written by export:
 *
 *     {"format": "evenecho-presets/1", "exportedAt": "ISO time", "presets": [plan, plan, …]}
 *
 * Both are untrusted: every entry is checked in full, and any problem refuses the whole file.
 */
import {z} from 'zod';
import {safeText} from '../files/text-field.js';
import {planFormatV1} from '../plan/plan-migration.js';
import {formatIssues, parsePlanDocument, planFormat, type PlanDocument} from '../plan/plan-schema.js';
import {checkPresetName, presetSlug} from './safe-name.js';
import {PresetStoreError} from './store-errors.js';

/** The `format` of an export bundle. */
export const bundleFormat = 'evenecho-presets/1';
/** Most presets one bundle may carry. */
export const maxBundlePresets = 500;

const bundleSchema = z.strictObject(
	{
		format: z.literal(bundleFormat),
		exportedAt: safeText(z.string({error: 'must be an ISO time'}).max(40, {error: 'must be an ISO time'})).optional(),
		presets: z
			.array(z.unknown(), {error: `must be a list of 1 to ${maxBundlePresets} plans`})
			.min(1, {error: `must be a list of 1 to ${maxBundlePresets} plans`})
			.max(maxBundlePresets, {error: `must be a list of 1 to ${maxBundlePresets} plans`}),
	},
	{error: 'must be a JSON object'},
);

/** A preset's name and its validated plan, as carried in exchange files. */
export interface NamedPlan {
	readonly name: string;
	readonly plan: PlanDocument;
}

/** What checking an import file gave: every preset in it, or every problem found. */
export type ImportDecode = {ok: true; kind: 'plan' | 'bundle'; items: NamedPlan[]} | {ok: false; problems: string[]};

/** The text of a bundle holding these presets (each plan carries its preset's name). */
export function encodeBundle(items: readonly NamedPlan[], exportedAt: Date = new Date()): string {
	const bundle = {
		format: bundleFormat,
		exportedAt: exportedAt.toISOString(),
		presets: items.map((p) => ({...p.plan, name: p.name})),
	};
	return JSON.stringify(bundle, null, 2) + '\n';
}

function checkEntry(value: unknown, prefix: string, problems: string[]): NamedPlan | undefined {
	const where = prefix ? `${prefix}.` : '';
	const raw =
		value !== null && typeof value === 'object' && !Array.isArray(value)
			? (value as Record<string, unknown>)
			: undefined;
	if (!raw) {
		problems.push(`${prefix || '(file)'}: must be a plan object`);
		return undefined;
	}
	let name: string | undefined;
	if (raw['name'] === undefined) {
		problems.push(`${where}name: missing; an imported preset takes its name from the plan's "name"`);
	} else {
		try {
			name = checkPresetName(raw['name'], `${where}name`);
		} catch (error) {
			if (!(error instanceof PresetStoreError)) throw error;
			problems.push(error.message);
		}
	}
	const plan = parsePlanDocument(raw);
	if (!plan.ok)
		problems.push(
			...plan.errors.map((e) =>
				e.startsWith('(plan)') ? `${prefix || '(plan)'}${e.slice('(plan)'.length)}` : `${where}${e}`,
			),
		);
	return name !== undefined && plan.ok ? {name, plan: {...plan.value, name}} : undefined;
}

/** Checks a parsed import file; on any problem nothing is returned but the list of problems. */
export function decodeImport(value: unknown): ImportDecode {
	const problems: string[] = [];
	const format =
		value !== null && typeof value === 'object' && !Array.isArray(value)
			? (value as Record<string, unknown>)['format']
			: undefined;
	if (format === bundleFormat) {
		const bundle = bundleSchema.safeParse(value);
		if (!bundle.success)
			return {ok: false, problems: formatIssues(bundle.error).map((p) => p.replace(/^\(plan\)/, '(file)'))};
		const items: NamedPlan[] = [];
		const seen = new Map<string, number>();
		bundle.data.presets.forEach((entry, i) => {
			const item = checkEntry(entry, `presets.${i}`, problems);
			if (!item) return;
			const slug = presetSlug(item.name);
			const first = seen.get(slug);
			if (first !== undefined)
				problems.push(`presets.${i}.name: "${item.name}" is the same preset name as presets.${first}`);
			else seen.set(slug, i);
			items.push(item);
		});
		return problems.length ? {ok: false, problems} : {ok: true, kind: 'bundle', items};
	}
	if (format !== undefined && format !== planFormat && format !== planFormatV1) {
		return {
			ok: false,
			problems: [
				`format: must be "${bundleFormat}" (a preset bundle) or "${planFormat}" (one plan; "${planFormatV1}" is read too)`,
			],
		};
	}
	const item = checkEntry(value, '', problems);
	return item && !problems.length ? {ok: true, kind: 'plan', items: [item]} : {ok: false, problems};
}
