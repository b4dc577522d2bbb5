/**
 * Screen layout as plain arithmetic on the terminal size, so it can be tested without a terminal.
 * 100 columns and wider: the step and the live curve side by side. Narrower: one pane, the curve
 * on its own step. The frame is kept one line shorter than the terminal so Ink never has to clear
 * the whole screen between frames.
 */
import {cautionLine} from '../../report/cautions.js';

/** Columns from which the step and the curve sit side by side. */
export const wideFrom = 100;

export interface Layout {
	readonly isWide: boolean;
	readonly columns: number;
	readonly rows: number;
	/** Lines the caution takes at this width. */
	readonly cautionRows: number;
	/** Lines between the step bar and the status line. */
	readonly bodyRows: number;
	/** Width of the step pane (all of it when narrow). */
	readonly stepWidth: number;
	/** Width of the curve pane beside it (0 when narrow). */
	readonly curveWidth: number;
	/** Plot size in the curve pane (wide) or on the curve step. */
	readonly plotWidth: number;
	readonly plotRows: number;
}

/** Lines a text takes when wrapped at word boundaries to `width`. */
export function wrappedLineCount(text: string, width: number): number {
	return wrapWords(text, width).length;
}

/** Greedy word wrap; words longer than the width are cut. */
export function wrapWords(text: string, width: number): string[] {
	const w = Math.max(1, width);
	const lines: string[] = [];
	let line = '';
	for (const word of text.split(/\s+/).filter(Boolean)) {
		if (!line) line = word;
		else if (line.length + 1 + word.length <= w) line += ` ${word}`;
		else {
			lines.push(line);
			line = word;
		}
		while (line.length > w) {
			lines.push(line.slice(0, w));
			line = line.slice(w);
		}
	}
	if (line) lines.push(line);
	return lines.length ? lines : [''];
}

export function layoutFor(columns: number, rows: number): Layout {
	const cols = Math.max(40, Math.floor(columns) || 80);
	const lines = Math.max(16, Math.floor(rows) || 24);
	const isWide = cols >= wideFrom;
	const cautionRows = wrappedLineCount(cautionLine, cols);
	// step bar + status line + hint line + caution, and one spare line at the bottom.
	const bodyRows = Math.max(8, lines - 3 - cautionRows - 1);
	if (isWide) {
		// The step gets the larger share: its labels and refusals are words, the plot is a sketch.
		const curveWidth = Math.min(56, Math.max(40, Math.floor(cols * 0.45)));
		const stepWidth = cols - curveWidth - 1;
		// Curve pane: title, axis, legend, two summary lines, up to three warning lines.
		return {
			isWide,
			columns: cols,
			rows: lines,
			cautionRows,
			bodyRows,
			stepWidth,
			curveWidth,
			plotWidth: curveWidth,
			plotRows: Math.max(4, bodyRows - 8),
		};
	}
	// Curve step, narrow: the plot on the left half with the slider table beside it; axis, legend and three warning lines.
	const plotWidth = Math.min(46, Math.floor(cols * 0.56));
	return {
		isWide,
		columns: cols,
		rows: lines,
		cautionRows,
		bodyRows,
		stepWidth: cols,
		curveWidth: 0,
		plotWidth,
		plotRows: Math.max(4, bodyRows - 5),
	};
}

/** The slice of a list to show so the cursor stays visible: [start, end). */
export function scrollWindow(count: number, cursor: number, size: number): {start: number; end: number} {
	if (count <= size) return {start: 0, end: count};
	const half = Math.floor(size / 2);
	const start = Math.max(0, Math.min(count - size, cursor - half));
	return {start, end: start + size};
}
