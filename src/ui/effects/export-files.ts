/**
 * Export: the plan as JSON (the plan file format, readable by `evenecho curve`) and the text
 * summary, written to a directory (the current one by default) through the file layer: each file
 * atomically, under a free name (`<stem>`, else `<stem>-2`, …) so an earlier export is never
 * replaced and a link or device planted under the name is passed over, never written through.
 */
import {computeCurve} from '../../engine/compensation-curve.js';
import {writeNewFiles} from '../../files/new-file.js';
import {slug} from '../../files/slug.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {resolvePlan} from '../../plan/resolve-plan.js';
import {curveSummary} from '../../report/curve-summary.js';

/** A file-name-safe form of the plan name (the project's one slug rule), at most 60 characters. */
export function fileStem(name: string): string {
	return slug(name, {maxChars: 60, fallback: 'plan'});
}

/** Writes `<stem>.plan.json` and `<stem>.summary.txt` (numbered if taken); returns the two file names. */
export function exportPlan(doc: PlanDocument, dir: string = process.cwd()): string[] {
	return writeNewFiles(dir, fileStem(doc.name), [
		['.plan.json', `${JSON.stringify(doc, null, '\t')}\n`],
		['.summary.txt', curveSummary(computeCurve(resolvePlan(doc)))],
	]);
}
