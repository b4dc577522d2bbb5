/** Step 4: the department's usual master and slider settings for this region, and this patient's change from them. */
import {Box, Text} from 'ink';
import type {SettingsDelta} from '../../engine/plan-difference.js';
import type {CurveResult} from '../../engine/types.js';
import {signedDb} from '../../report/curve-summary.js';
import {FieldList, windowNote} from './field-list.js';
import {wrapWords} from '../kit/layout.js';
import type {StepProps} from './start-step.js';
import {rowsOf, type Row} from '../state/step-rows.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';

export interface UsualStepProps extends StepProps {
	readonly curve: CurveResult;
	readonly delta: SettingsDelta | null;
}

export function UsualStep({state, width, height, isFocused, curve, delta}: UsualStepProps) {
	const theme = useTheme();
	const rows = rowsOf(state, 'usual');
	const extra = (row: Row) => {
		if (row.kind !== 'number' || !delta) return undefined;
		if (row.key === 'refMasterDb')
			return `patient ${curve.fit.masterGainDb.toFixed(1)} (${signedDb(delta.masterDeltaDb)})`;
		if (row.key === 'refSliderDb') {
			const s = curve.fit.sliders[row.index];
			return s ? `patient ${signedDb(s.gainDb)} (${signedDb(delta.sliderDeltasDb[row.index]!)})` : undefined;
		}
		return undefined;
	};
	const note = state.doc.reference
		? []
		: wrapWords(
				"Switch on to see this patient's master and sliders as changes from the department's usual settings for the region.",
				width - 2,
			).map((l) => `  ${l}`);
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.current}>
				{clip(
					`4 Usual gains: the department's, for this region${windowNote(state, rows, state.cursors.usual, height - 1 - note.length)}`,
					width,
				)}
			</Text>
			<FieldList
				state={state}
				rows={rows}
				cursor={state.cursors.usual}
				width={width}
				height={height - 1 - note.length}
				isFocused={isFocused}
				extra={extra}
				labelWidth={18}
			/>
			{note.map((l) => (
				<Text key={l} wrap="truncate" {...theme.muted}>
					{l}
				</Text>
			))}
		</Box>
	);
}
