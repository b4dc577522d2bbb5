/**
 * Export: the plan as JSON (the plan file format, readable by `evenecho curve`) and the text
 * summary, or the fat sweep's four formats, written into the folder the user typed through the file
 * layer: all files as one batch, existing regular files replaced only after the user said yes, and a
 * link or device under a name refused with nothing written.
 */
import {lstatSync} from 'node:fs';
import {join, resolve} from 'node:path';
import {computeCurve} from '../../engine/compensation-curve.js';
import {entryAt} from '../../files/atomic-write.js';
import {commitBatch, type BatchEntry} from '../../files/file-batch.js';
import {printable} from '../../files/printable.js';
import {slug} from '../../files/slug.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {resolvePlan} from '../../plan/resolve-plan.js';
import {curveSummary} from '../../report/curve-summary.js';

/** A file-name-safe form of the plan name (the project's one slug rule), at most 60 characters. */
export function fileStem(name: string): string {
	return slug(name, {maxChars: 60, fallback: 'plan'});
}

/** What writing files into a named folder came to. */
export type FolderExport =
	| {readonly ok: true; readonly paths: readonly string[]}
	| {readonly ok: false; readonly exists: readonly string[]; readonly dir: string}
	| {readonly ok: false; readonly message: string};

/** The plan's two files: `<stem>.plan.json` and `<stem>.summary.txt`. */
export function planEntries(doc: PlanDocument): BatchEntry[] {
	const stem = fileStem(doc.name);
	return [
		{name: `${stem}.plan.json`, data: `${JSON.stringify(doc, null, '\t')}\n`},
		{name: `${stem}.summary.txt`, data: curveSummary(computeCurve(resolvePlan(doc)))},
	];
}

/**
 * Writes `entries` into the folder the user typed (relative to the current one), all or none (the
 * file layer's batch). Names already taken are reported unless `replace` is given; only regular
 * files are ever replaced, links and special files are refused, and nothing is written outside
 * `dir`. Every console export (the plan, the fat sweep) goes through here.
 */
export function exportToFolder(entries: readonly BatchEntry[], typed: string, replace: boolean): FolderExport {
	const dir = resolve(typed.trim() || '.');
	let isFolder = false;
	try {
		isFolder = lstatSync(dir).isDirectory();
	} catch {
		return {ok: false, message: `Export folder ${printable(dir)} does not exist; type an existing folder.`};
	}
	if (!isFolder)
		return {ok: false, message: `Export folder ${printable(dir)} is not a folder (a file or a link); type a folder.`};
	const taken = entries.filter((e) => entryAt(join(dir, e.name)) !== undefined).map((e) => e.name);
	if (taken.length > 0 && !replace) return {ok: false, exists: taken, dir};
	commitBatch(dir, entries, {replace});
	return {ok: true, paths: entries.map((e) => join(dir, e.name))};
}

/** The plan's two files into the typed folder (see `exportToFolder`). */
export function exportPlanToFolder(doc: PlanDocument, typed: string, replace: boolean): FolderExport {
	return exportToFolder(planEntries(doc), typed, replace);
}
