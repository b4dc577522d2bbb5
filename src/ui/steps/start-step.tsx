/** Step 1: where the plan starts, the built-in demo, the region templates and saved presets. */
import {Box, Text} from 'ink';
import type {ConsoleState} from '../state/console-state.js';
import {FieldList, windowNote} from './field-list.js';
import {rowsOf} from '../state/step-rows.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';
import {wrapWords} from '../kit/layout.js';
import {planWithNote} from '../../plan/plan-note.js';

export interface StepProps {
	readonly state: ConsoleState;
	readonly width: number;
	readonly height: number;
	readonly isFocused: boolean;
}

export function StartStep({state, width, height, isFocused}: StepProps) {
	const theme = useTheme();
	const rows = rowsOf(state, 'start');
	const problems = state.storeProblems.slice(0, 2);
	const point = rows[state.cursors.start];
	const about = point?.kind === 'start' ? `  region: ${point.point.region}` : '';
	// The plan's note under the list, marked when the values have moved on from it.
	const note = planWithNote(state.doc, state.origin).note;
	const noteRoom = Math.max(0, Math.min(6, height - 3 - problems.length - rows.length - 1));
	const noteLines = note && noteRoom > 0 ? wrapWords(`Note: ${note}`, width).slice(0, noteRoom) : [];
	if (note && noteLines.length === noteRoom && noteRoom > 0 && wrapWords(`Note: ${note}`, width).length > noteRoom) {
		noteLines[noteRoom - 1] = clip(`${noteLines[noteRoom - 1]} …`, width);
	}
	const listHeight = height - 3 - problems.length - noteLines.length;
	// Which of two same-named entries the plan came from: a saved preset is remembered by name.
	const shared =
		state.startingPoints.filter((p) => p.name.trim().toLowerCase() === state.doc.name.trim().toLowerCase()).length > 1;
	const from = shared ? (state.presetName === state.doc.name ? ' (your preset)' : ' (template)') : '';
	const now = `Now: "${state.doc.name}"${from} [${state.doc.region}]${state.dirty ? ', changed' : ''}`;
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.current}>
				{clip(
					`1 Starting plan: a region template or a saved preset${windowNote(state, rows, state.cursors.start, listHeight)}`,
					width,
				)}
			</Text>
			<Text wrap="truncate" {...theme.muted}>
				{clip(now, width)}
			</Text>
			<FieldList
				state={state}
				rows={rows}
				cursor={state.cursors.start}
				width={width}
				height={listHeight}
				isFocused={isFocused}
				labelWidth={width - 13}
			/>
			<Text wrap="truncate" {...theme.muted}>
				{clip(about, width)}
			</Text>
			{noteLines.map((l, i) => (
				<Text key={`note-${i}`} wrap="truncate" {...theme.muted}>
					{clip(l, width)}
				</Text>
			))}
			{problems.map((p) => (
				<Text key={p} wrap="truncate" {...theme.warning}>
					{clip(`! ${p}`, width)}
				</Text>
			))}
		</Box>
	);
}
