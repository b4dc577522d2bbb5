/**
 * Step 5's fat-thickness sweep: the current plan fitted at each thickness of its fat layer, one
 * row per thickness, the thickness column fixed and the others scrolling, with the list field on
 * top; the export's full path is said on the status line. Uses the whole width in both layouts.
 */
import {Box, Text} from 'ink';
import {fatLayerToSweep} from '../../plan/fat-layer.js';
import type {ConsoleState} from '../state/console-state.js';
import {wrapWords} from '../kit/layout.js';
import {refusalLines} from '../kit/row-line.js';
import {thicknessText} from '../state/row-text.js';
import {sweepFatCm, sweepFieldText} from '../state/sweep-state.js';
import {sweepTable} from '../state/sweep-table.js';
import {columnKey, sweepGrid, warningKey} from '../state/sweep-view-model.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';

export interface SweepViewProps {
	readonly state: ConsoleState;
	readonly width: number;
	readonly height: number;
}

/** Table rows kept on screen (when the list has them) before the notes under the table give way. */
const minRows = 8;

/** The list field: `Thicknesses, cm: [1,2,4]` with what Enter does, and a refusal beside it or under it. */
export function fieldLines(state: ConsoleState, width: number): {text: string; isRefusal: boolean}[] {
	const sw = state.sweep;
	const text = sweepFieldText(sw, state.doc);
	const head = sw.typing
		? `Thicknesses, cm: [${text}_]  Enter applies, Esc cancels`
		: `Thicknesses, cm: [${text}]  Enter edits (1,2,4,6,8 or 1:8:1)`;
	if (!sw.refusal) return [{text: clip(head, width), isRefusal: false}];
	const beside = `${head}  ! ${sw.refusal}`;
	if (beside.length <= width) return [{text: beside, isRefusal: true}];
	const under = wrapWords(`! ${sw.refusal}`, width - 2)
		.slice(0, refusalLines)
		.map((l) => ({text: `  ${l}`, isRefusal: true}));
	return [{text: clip(head, width), isRefusal: false}, ...under];
}

export function titleText(state: ConsoleState): string {
	const i = fatLayerToSweep(state.doc);
	const layer =
		i === null ? '' : `: layer ${i + 1}; the plan has ${thicknessText(state.doc.layers[i]!.thicknessCm)} cm`;
	return `5 Curve & save › Sweep over fat thickness${layer}`;
}

export function SweepView({state, width, height}: SweepViewProps) {
	const theme = useTheme();
	const sw = state.sweep;
	const outcome = sweepTable(state.doc, sweepFatCm(sw, state.doc), sw.isDelta);
	const field = fieldLines(state, width);
	const top = (
		<>
			<Text wrap="truncate" {...theme.current}>
				{clip(titleText(state), width)}
			</Text>
			{field.map((l, i) => (
				<Text key={`f${i}`} wrap="truncate" {...(l.isRefusal ? theme.refusal : theme.value)}>
					{l.text}
				</Text>
			))}
		</>
	);
	const bottom = (lines: readonly string[], style: object) =>
		lines.map((l, i) => (
			<Text key={`${l}${i}`} wrap="truncate" {...style}>
				{clip(l, width)}
			</Text>
		));
	if (!outcome.ok) {
		const room = Math.max(1, height - 1 - field.length);
		return (
			<Box flexDirection="column" width={width}>
				{top}
				{bottom(wrapWords(`! ${outcome.message}`, width).slice(0, room), theme.refusal)}
			</Box>
		);
	}
	const table = outcome.table;
	const warnLine = warningKey(table);
	// Notes under the table give way (the column key first, from its end) when the rows would get too few.
	const fixedRows = 1 + field.length + 1 + 2;
	// Whole notes, each a paragraph: the warning codes first, then what the columns mean.
	const paragraphs = [...(warnLine === null ? [] : [warnLine]), ...columnKey(table)].map((p) => wrapWords(p, width));
	const lineCount = () => paragraphs.reduce((n, p) => n + p.length, 0);
	while (paragraphs.length && height - fixedRows - lineCount() < Math.min(minRows, table.rows.length)) paragraphs.pop();
	const warnLines = warnLine !== null && paragraphs.length ? paragraphs[0]!.length : 0;
	const notes = paragraphs.flat();
	const grid = sweepGrid(table, {
		width,
		height: Math.max(1, height - fixedRows - notes.length),
		cursor: sw.row,
		column: sw.column,
	});
	const mode = sw.isDelta ? 'Δ = row minus the plan; d: values' : 'values in dB; d: deltas';
	return (
		<Box flexDirection="column" width={width}>
			{top}
			<Text wrap="truncate">{clip(`${grid.position}; ${mode}`, width)}</Text>
			{grid.header.map((l, i) => (
				<Text key={`h${i}`} wrap="truncate" {...theme.muted}>
					{l || ' '}
				</Text>
			))}
			{grid.lines.map((l) => (
				<Text key={l.index} wrap="truncate" {...(l.isSelected ? theme.selected : {})}>
					{l.text}
				</Text>
			))}
			{notes.map((l, i) => (
				<Text key={`n${i}`} wrap="truncate" {...(i < warnLines ? theme.warning : theme.muted)}>
					{clip(l, width)}
				</Text>
			))}
		</Box>
	);
}
