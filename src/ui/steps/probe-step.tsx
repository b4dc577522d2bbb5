/** Step 3: the probe, the display, the slider bank, master gain range and the noise budget. */
import {Box, Text} from 'ink';
import {FieldList, windowNote} from './field-list.js';
import {derivedNoiseBudgetDb} from '../state/plan-fields.js';
import type {StepProps} from './start-step.js';
import {rowsOf} from '../state/step-rows.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';

export function ProbeStep({state, width, height, isFocused}: StepProps) {
	const theme = useTheme();
	const rows = rowsOf(state, 'probe');
	const budget = derivedNoiseBudgetDb(state.doc);
	const from = state.doc.phantomCalibration ? 'from the phantom reach' : 'as typed';
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.current}>
				{clip(`3 Probe & system${windowNote(state, rows, state.cursors.probe, height - 2)}`, width)}
			</Text>
			<FieldList
				state={state}
				rows={rows}
				cursor={state.cursors.probe}
				width={width}
				height={height - 2}
				isFocused={isFocused}
			/>
			<Text wrap="truncate" {...theme.muted}>
				{clip(`  budget in use: ${budget.toFixed(1)} dB, ${from}`, width)}
			</Text>
		</Box>
	);
}
