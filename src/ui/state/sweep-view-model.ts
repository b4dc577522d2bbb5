/**
 * The sweep table as fixed-width text, pure: which rows and columns fit a width and a height at a
 * cursor and a column offset, and the words that say where the window is. The thickness column
 * always stays on the left; the others scroll. Column widths depend only on the slider count and
 * whether deltas are shown, so the reducer can clamp the offset without the table.
 */
import type {WarningCode} from '../../engine/types.js';
import type {ProtocolTable, TableRow} from '../../table/sweep-runner.js';
import {fixed, rowWarningCodes, signed, warningCodesUsed} from '../../table/table-common.js';
import {glyph} from '../kit/depth-plot.js';
import {scrollWindow} from '../kit/layout.js';
import {thicknessText} from './row-text.js';
import {clip} from '../kit/text-fit.js';

/** Width of the thickness column with the cursor mark ("> 12.25"). */
export const frozenWidth = 7;
/** Narrowest the last (warnings) column may be. */
const warningsMin = 9;

/** Short warning codes, each led by the plot's own character so no colour is needed. */
export const shortCodes: Record<WarningCode, {readonly code: string; readonly means: string}> = {
	'strong-reflector': {code: `${glyph.blocked}reflect`, means: 'a boundary sends most of the beam back'},
	'strong-absorber': {code: `${glyph.blocked}absorb`, means: 'a layer absorbs nearly all of it'},
	'below-noise-floor': {code: `${glyph.noise}noise`, means: 'echo under the noise floor inside the display'},
	'slider-range-exceeded': {code: '!sliders', means: 'the controls miss the curve by over 2 dB'},
	'speed-mismatch': {code: '!speed', means: 'a layer is drawn thicker or thinner'},
	'harmonic-simplified': {code: 'i harmonic', means: 'harmonic receive (see the notes for the model)'},
	'budget-receive-mismatch': {code: '!budget', means: 'noise budget measured in another receive mode'},
	'thick-body-wall': {code: 'i wall', means: 'thick fat: reach changes, wall clutter stays'},
	'refraction-shift': {code: 'i refract', means: 'an oblique beam draws deep targets sideways'},
	'scanner-profile': {code: 'i measured', means: 'depth gain measured on this scanner'},
};

export type ColumnKind = 'slider' | 'master-delta' | 'master' | 'fit' | 'floor' | 'fmax' | 'warnings';

export interface ColumnHead {
	readonly kind: ColumnKind;
	/** Slider number, 0-based (slider columns only). */
	readonly index: number;
	readonly head: string;
	/** Width including the one-space gap before it. */
	readonly width: number;
}

/** The scrolled columns for a slider count, in order. */
export function columnHeads(sliderCount: number, isDelta: boolean): ColumnHead[] {
	const d = isDelta ? 'Δ' : '';
	const out: ColumnHead[] = Array.from(
		{length: sliderCount},
		(_, k): ColumnHead => ({kind: 'slider', index: k, head: `${d}S${k + 1}`, width: 6}),
	);
	if (isDelta) out.push({kind: 'master-delta', index: 0, head: 'Δmaster', width: 8});
	out.push(
		{kind: 'master', index: 0, head: 'master', width: 7},
		{kind: 'fit', index: 0, head: 'fit±', width: 6},
		{kind: 'floor', index: 0, head: 'floor', width: 6},
		{kind: 'fmax', index: 0, head: 'f max', width: 6},
		{kind: 'warnings', index: 0, head: 'warnings', width: warningsMin},
	);
	return out;
}

/** The smallest offset that still shows every remaining column; scrolling further would only hide columns. */
export function maxColumnOffset(sliderCount: number, isDelta: boolean, width: number): number {
	const heads = columnHeads(sliderCount, isDelta);
	let used = frozenWidth;
	for (let o = heads.length - 1; o >= 0; o--) {
		used += heads[o]!.width;
		if (used > width) return Math.min(heads.length - 1, o + 1);
	}
	return 0;
}

function unitOf(c: ColumnHead, t: ProtocolTable): string {
	switch (c.kind) {
		case 'slider':
			return `@${fixed(t.knotDepthsCm[c.index] ?? 0, 1)}`;
		case 'master-delta':
		case 'master':
		case 'fit':
			return 'dB';
		case 'floor':
			return 'cm';
		case 'fmax':
			return 'MHz';
		case 'warnings':
			return '';
	}
}

function cellOf(c: ColumnHead, t: ProtocolTable, r: TableRow): string {
	switch (c.kind) {
		case 'slider':
			return signed(r.delta ? r.delta.sliderDeltasDb[c.index]! : r.slidersDb[c.index]!, 1);
		case 'master-delta':
			return signed(r.delta?.masterDeltaDb ?? 0, 1);
		case 'master':
			return fixed(r.masterGainDb, 1);
		case 'fit':
			return fixed(r.residualDb, 1);
		case 'floor':
			return r.penetrationDepthCm === null
				? `>${fixed(t.sweep.doc.display.depthCm, 0)}`
				: fixed(r.penetrationDepthCm, 1);
		case 'fmax':
			return r.highestReachingMhz === null ? 'none' : fixed(r.highestReachingMhz, 1);
		case 'warnings':
			return (
				rowWarningCodes(r)
					.map((code) => shortCodes[code].code)
					.join(' ') || '-'
			);
	}
}

function fit(text: string, c: ColumnHead, width: number): string {
	if (c.kind === 'warnings') return ` ${clip(text, width - 1)}`.padEnd(width);
	return clip(text, width - 1).padStart(width);
}

export interface GridLine {
	readonly text: string;
	readonly isSelected: boolean;
	/** Row index in the table, 0-based. */
	readonly index: number;
}

export interface SweepGrid {
	/** Names, then units (the slider line gives each knot's depth in cm after `@`). */
	readonly header: readonly [string, string];
	readonly lines: readonly GridLine[];
	readonly rowStart: number;
	readonly rowEnd: number;
	readonly rowCount: number;
	/** Scrolled columns shown: [start, end) of count (the thickness column is not counted). */
	readonly columnStart: number;
	readonly columnEnd: number;
	readonly columnCount: number;
	/** "rows 1-7 of 7  columns 1-11 of 13, → more": where the window is, in words. */
	readonly position: string;
}

export interface GridOptions {
	readonly width: number;
	/** Lines for the table's rows (the two header lines not included). */
	readonly height: number;
	readonly cursor: number;
	readonly column: number;
}

/** The window of the table that fits, with the cursor row visible and marked `>`. */
export function sweepGrid(t: ProtocolTable, o: GridOptions): SweepGrid {
	const heads = columnHeads(t.knotDepthsCm.length, t.sweep.delta);
	const columnStart = Math.max(0, Math.min(o.column, maxColumnOffset(t.knotDepthsCm.length, t.sweep.delta, o.width)));
	const shown: {head: ColumnHead; width: number}[] = [];
	let used = frozenWidth;
	for (let i = columnStart; i < heads.length; i++) {
		const head = heads[i]!;
		if (shown.length > 0 && used + head.width > o.width) break;
		const width = head.kind === 'warnings' ? Math.max(head.width, o.width - used) : head.width;
		shown.push({head, width});
		used += width;
	}
	const columnEnd = columnStart + shown.length;
	const rowCount = t.rows.length;
	const cursor = Math.max(0, Math.min(rowCount - 1, o.cursor));
	const {start, end} = scrollWindow(rowCount, cursor, Math.max(1, o.height));
	const cut = (s: string) => clip(s, o.width).trimEnd();
	const header: [string, string] = [
		cut(`${'fat'.padStart(frozenWidth)}${shown.map((c) => fit(c.head.head, c.head, c.width)).join('')}`),
		cut(`${'cm'.padStart(frozenWidth)}${shown.map((c) => fit(unitOf(c.head, t), c.head, c.width)).join('')}`),
	];
	const lines = t.rows.slice(start, end).map((r, k): GridLine => {
		const index = start + k;
		const isSelected = index === cursor;
		const mark = isSelected ? '>' : ' ';
		const cells = shown.map((c) => fit(cellOf(c.head, t, r), c.head, c.width)).join('');
		const text = `${mark} ${thicknessText(r.layerCm ?? 0).padStart(frozenWidth - 2)}${cells}`;
		return {text: cut(text), isSelected, index};
	});
	const more = [columnStart > 0 ? '← more' : '', columnEnd < heads.length ? '→ more' : ''].filter(Boolean).join(', ');
	const position =
		`rows ${rowCount ? start + 1 : 0}-${end} of ${rowCount}  columns ${columnStart + 1}-${columnEnd} of ` +
		`${heads.length}${more ? `, ${more}` : ''}`;
	return {
		header,
		lines,
		rowStart: start,
		rowEnd: end,
		rowCount,
		columnStart,
		columnEnd,
		columnCount: heads.length,
		position,
	};
}

/** What the warning codes in this table mean, for the line under it; null when no row has one. */
export function warningKey(t: ProtocolTable): string | null {
	const codes = warningCodesUsed(t.rows);
	if (codes.length === 0) return null;
	return codes.map((c) => `${shortCodes[c].code} ${shortCodes[c].means}`).join('; ');
}

/** What the columns mean, one sentence each, for the lines under the table. */
export function columnKey(t: ProtocolTable): string[] {
	const depth = fixed(t.sweep.doc.display.depthCm, 0);
	const target = fixed(t.sweep.targetDepthCm, 0);
	const n = t.knotDepthsCm.length;
	const what = t.sweep.delta ? 'each row minus the plan as it is' : 'slider settings';
	return [
		`S1-S${n}: ${what}, dB, at the depth after @ (cm).`,
		`floor: depth where the echo meets the noise floor, cm (>${depth}: below the display).`,
		`f max: highest MHz whose echo from ${target} cm stays above the noise floor.`,
	];
}
