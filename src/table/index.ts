/**
 * Protocol tables, for the command line and the console: check and run a sweep, then format it.
 * Everything here is pure and synchronous (the progress bar writes only to the stream it is given).
 */
export * from './sweep.js';
export * from './sweep-options.js';
export {fixed, roundTo, signed, warningLegend, type TableFormatOptions} from './table-common.js';
export {markdownColumns, tableMarkdown} from './table-markdown.js';
export {csvCells, csvHeader, tableCsv} from './table-csv.js';
export {tableFormat, tableJson, tableJsonSchema, tableJsonText, type TableJson} from './table-json.js';
export {checkSvgSweep, maxSvgLines, maxSvgPanels, tableSvg} from './table-svg.js';
export {createProgressBar, type ProgressBar, type ProgressOptions, type ProgressStream} from './progress-bar.js';
