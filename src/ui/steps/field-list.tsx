/** A scrolling list of a step's rows, keeping the cursor in view within `height` lines. */
import {Box} from 'ink';
import type {ConsoleState} from '../state/console-state.js';
import {scrollWindow} from '../kit/layout.js';
import {refusalLines, RowLine} from '../kit/row-line.js';
import {rowText} from '../state/row-text.js';
import type {Row} from '../state/step-rows.js';

export interface FieldListProps {
	readonly state: ConsoleState;
	readonly rows: readonly Row[];
	readonly cursor: number;
	readonly width: number;
	readonly height: number;
	readonly isFocused: boolean;
	readonly extra?: (row: Row) => string | undefined;
	readonly labelWidth?: number;
}

/** Rows shown for a list of `count` in `height` lines (some kept for a refusal under a row). */
export function listWindow(count: number, cursor: number, height: number, hasRefusal: boolean) {
	return scrollWindow(count, cursor, Math.max(1, height - (hasRefusal ? refusalLines : 0)));
}

/** " (rows 3-18 of 19)" when the list scrolls, so rows out of view are never a surprise; else ''. */
export function windowNote(state: ConsoleState, rows: readonly Row[], cursor: number, height: number): string {
	const hasRefusal = state.refusal !== null && rows.some((r) => r.id === state.refusal?.rowId);
	const {start, end} = listWindow(rows.length, cursor, height, hasRefusal);
	return start > 0 || end < rows.length ? ` (rows ${start + 1}-${end} of ${rows.length})` : '';
}

export function FieldList({state, rows, cursor, width, height, isFocused, extra, labelWidth}: FieldListProps) {
	const hasRefusal = state.refusal !== null && rows.some((r) => r.id === state.refusal?.rowId);
	const {start, end} = listWindow(rows.length, cursor, height, hasRefusal);
	return (
		<Box flexDirection="column" width={width}>
			{rows.slice(start, end).map((row, k) => {
				const i = start + k;
				const t = rowText(state, row);
				const isTyping = state.editing?.rowId === row.id && i === cursor;
				const refusal = state.refusal?.rowId === row.id ? state.refusal.message : undefined;
				return (
					<RowLine
						key={row.id}
						label={t.label}
						value={t.value}
						width={width}
						isSelected={isFocused && i === cursor}
						{...(isTyping ? {typing: state.editing!.text} : {})}
						{...(refusal === undefined ? {} : {refusal})}
						{...(extra?.(row) ? {extra: extra(row)} : {})}
						{...(labelWidth === undefined ? {} : {labelWidth})}
					/>
				);
			})}
		</Box>
	);
}
