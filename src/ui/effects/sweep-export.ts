/**
 * Export of the fat-thickness sweep: the same table in the four formats of `evenecho table`
 * (Markdown, CSV, JSON, SVG), written into a directory (the current one by default), each to a
 * temp name first and then renamed. No time stamp, so the same plan and list give the same bytes.
 */
import {join} from 'node:path';
import type {ProtocolTable} from '../../table/sweep.js';
import {tableCsv} from '../../table/table-csv.js';
import {tableJsonText} from '../../table/table-json.js';
import {tableMarkdown} from '../../table/table-markdown.js';
import {tableSvg} from '../../table/table-svg.js';
import {fileStem, writeAtomically} from './export-files.js';

/** Writes `<stem>.fat-sweep.md`, `.csv`, `.json` and `.svg`; returns the four file names. */
export function exportSweep(table: ProtocolTable, dir: string = process.cwd()): string[] {
	const stem = `${fileStem(table.sweep.doc.name)}.fat-sweep`;
	const files: [string, string][] = [
		[`${stem}.md`, tableMarkdown(table)],
		[`${stem}.csv`, tableCsv(table)],
		[`${stem}.json`, tableJsonText(table)],
		[`${stem}.svg`, tableSvg(table)],
	];
	for (const [name, text] of files) writeAtomically(join(dir, name), text);
	return files.map(([name]) => name);
}
