/**
 * Export: the plan as JSON (the plan file format, readable by `evenecho curve`) and the text
 * summary, written to a directory (the current one by default). Each file is written to a temp
 * name first and renamed, so a half-written file never carries the real name.
 */
import {renameSync, rmSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {computeCurve} from '../../engine/compensation-curve.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {resolvePlan} from '../../plan/resolve-plan.js';
import {curveSummary} from '../../report/curve-summary.js';

/** A file-name-safe form of the plan name: lower case, letters, digits and dashes. */
export function fileStem(name: string): string {
	const stem = name
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 60);
	return stem || 'plan';
}

/** Writes `text` to a temp name beside `path`, then renames it over `path` (the temp file is removed on failure). */
export function writeAtomically(path: string, text: string): void {
	const temp = `${path}.${process.pid}.tmp`;
	try {
		writeFileSync(temp, text, 'utf8');
		renameSync(temp, path);
	} catch (error) {
		rmSync(temp, {force: true});
		throw error;
	}
}

/** Writes `<stem>.plan.json` and `<stem>.summary.txt`; returns the two file names. */
export function exportPlan(doc: PlanDocument, dir: string = process.cwd()): string[] {
	const stem = fileStem(doc.name);
	const json = `${stem}.plan.json`;
	const text = `${stem}.summary.txt`;
	writeAtomically(join(dir, json), `${JSON.stringify(doc, null, '\t')}\n`);
	writeAtomically(join(dir, text), curveSummary(computeCurve(resolvePlan(doc))));
	return [json, text];
}
