/**
 * Export of the fat-thickness sweep: the same table in the four formats of `evenecho table`
 * (Markdown, CSV, JSON, SVG), written into a directory (the current one by default) through the
 * file layer: atomically, under free names (numbered when taken), never through a link. No time
 * stamp, so the same plan and list give the same bytes.
 */
import {writeNewFiles} from '../../files/new-file.js';
import type {ProtocolTable} from '../../table/sweep-runner.js';
import {tableCsv} from '../../table/table-csv.js';
import {tableJsonText} from '../../table/table-json.js';
import {tableMarkdown} from '../../table/table-markdown.js';
import {tableSvg} from '../../table/table-svg.js';
import {fileStem} from './export-files.js';

/** Writes `<stem>.fat-sweep.md`, `.csv`, `.json` and `.svg` (numbered if taken); returns the four file names. */
export function exportSweep(table: ProtocolTable, dir: string = process.cwd()): string[] {
	return writeNewFiles(dir, `${fileStem(table.sweep.doc.name)}.fat-sweep`, [
		['.md', tableMarkdown(table)],
		['.csv', tableCsv(table)],
		['.json', tableJsonText(table)],
		['.svg', tableSvg(table)],
	]);
}
