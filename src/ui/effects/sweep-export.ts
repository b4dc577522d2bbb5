/**
 * Export of the fat-thickness sweep: the same table in the four formats of `evenecho table`
 * (Markdown, CSV, JSON, SVG), written like the plan's export (the folder asked, files already
 * there replaced only after a yes, all four or none). No time stamp, so the same plan and list
 * give the same bytes.
 */
import type {BatchEntry} from '../../files/file-batch.js';
import type {ProtocolTable} from '../../table/sweep-runner.js';
import {tableCsv} from '../../table/table-csv.js';
import {tableJsonText} from '../../table/table-json.js';
import {tableMarkdown} from '../../table/table-markdown.js';
import {tableSvg} from '../../table/table-svg.js';
import {fileStem} from './export-files.js';

/** `<stem>.fat-sweep.md`, `.csv`, `.json` and `.svg`. */
export function sweepEntries(table: ProtocolTable): BatchEntry[] {
	const stem = `${fileStem(table.sweep.doc.name)}.fat-sweep`;
	return [
		{name: `${stem}.md`, data: tableMarkdown(table)},
		{name: `${stem}.csv`, data: tableCsv(table)},
		{name: `${stem}.json`, data: tableJsonText(table)},
		{name: `${stem}.svg`, data: tableSvg(table)},
	];
}
