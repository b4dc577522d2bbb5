/**
 * The fat-thickness sweep's table for the console: the protocol-table code run synchronously on
 * the current plan, remembered per (plan, list, deltas) so the view, a key press and an export
 * share one run. Failures become a plain message; nothing here throws.
 */
import {limits, type PlanDocument} from '../../plan/plan-schema.js';
import {SweepError} from '../../table/sweep-spec.js';
import {buildTable, type ProtocolTable} from '../../table/sweep-runner.js';
import {parseNumberList} from '../../table/sweep-options.js';
import {maxSweepValues} from './sweep-state.js';

export type SweepOutcome =
	| {readonly ok: true; readonly table: ProtocolTable}
	| {readonly ok: false; readonly message: string};

export type ListOutcome =
	| {readonly ok: true; readonly fatCm: number[]}
	| {readonly ok: false; readonly message: string};

/**
 * A table-code message in the console's words: without the command-line option it starts with,
 * and without advice to use a command-line option the console does not have.
 */
export function consoleMessage(message: string): string {
	const text = message
		.replace(/^--[a-z]+(?: [a-z]+)?: /, '')
		.replace(/; choose (?:the layer to sweep|another) with --layer N.*$/, '');
	if (/no layer of tissue "fat"/.test(text))
		return `${text}, so there is no thickness to sweep: give a layer the tissue Fat on step 2 (Tissue stack)`;
	if (/deepest layer/.test(text)) return `${text}: the fat layer must have a layer below it (step 2, Tissue stack)`;
	return text;
}

const messageOf = (error: unknown) =>
	error instanceof SweepError
		? consoleMessage(error.message)
		: `the table could not be worked out: ${error instanceof Error ? error.message : String(error)}`;

/** Checks typed text with the table code's own parser: a list ("1,2,4") or from:to:step ("1:8:1"), at most 16 values. */
export function parseFatList(text: string): ListOutcome {
	try {
		return {ok: true, fatCm: parseNumberList('fat', text, limits.thicknessCm, 'cm', maxSweepValues)};
	} catch (error) {
		return {ok: false, message: messageOf(error)};
	}
}

const remembered = new WeakMap<PlanDocument, Map<string, SweepOutcome>>();
/** Lists remembered per plan (a plan is replaced, not changed, on every edit). */
const perPlan = 8;

/** The plan swept over `fatCm` (its first fat layer), sliders as values or deltas. */
export function sweepTable(doc: PlanDocument, fatCm: readonly number[], isDelta: boolean): SweepOutcome {
	const key = `${fatCm.join(',')}|${isDelta ? 'delta' : 'values'}`;
	let byKey = remembered.get(doc);
	const hit = byKey?.get(key);
	if (hit) return hit;
	let outcome: SweepOutcome;
	try {
		outcome = {ok: true, table: buildTable(doc, {fatCm, delta: isDelta})};
	} catch (error) {
		outcome = {ok: false, message: messageOf(error)};
	}
	if (!byKey) remembered.set(doc, (byKey = new Map()));
	if (byKey.size >= perPlan) byKey.delete(byKey.keys().next().value!);
	byKey.set(key, outcome);
	return outcome;
}
