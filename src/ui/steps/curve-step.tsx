/**
 * Step 5, the result: the sliders to set, master gain, how well they follow the curve, reach,
 * warnings, and the save / export / fat-sweep actions. Narrow: the plot sits beside the table on this step.
 */
import {Box, Text} from 'ink';
import type {SettingsDelta} from '../../engine/plan-difference.js';
import type {CurveResult} from '../../engine/types.js';
import type {ConsoleState} from '../state/console-state.js';
import {fitLine, masterLine, reachText, shortWarning} from '../state/curve-facts.js';
import {wrapWords} from '../kit/layout.js';
import type {Layout} from '../kit/layout.js';
import {PictureView} from '../picture/picture-view.js';
import {BankView} from '../plot/bank-view.js';
import {PlotView} from '../plot/plot-view.js';
import {RowLine} from '../kit/row-line.js';
import {bankTrackFor, SliderTable} from '../plot/slider-table.js';
import {rowsOf} from '../state/step-rows.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';
import {WarningLines} from '../plot/warning-lines.js';

export interface CurveStepProps {
	readonly state: ConsoleState;
	readonly curve: CurveResult;
	readonly delta: SettingsDelta | null;
	readonly layout: Layout;
	readonly width: number;
	readonly height: number;
}

function Actions({state, width}: {readonly state: ConsoleState; readonly width: number}) {
	const rows = rowsOf(state, 'curve');
	const cursor = state.cursors.curve;
	return (
		<>
			{rows
				.map((row, i) => ({row, i}))
				.filter(({row}) => row.kind === 'action')
				.map(({row, i}) => (
					<RowLine
						key={row.id}
						label={row.kind === 'action' ? `[ ${row.label} ]` : ''}
						value=""
						width={width}
						isSelected={i === cursor}
						labelWidth={width - 3}
					/>
				))}
		</>
	);
}

export function CurveStep({state, curve, delta, layout, width, height}: CurveStepProps) {
	const theme = useTheme();
	const count = curve.fit.sliders.length;
	const cursor = state.cursors.curve;
	const slider = cursor < count ? cursor : -1;
	const actionCount = rowsOf(state, 'curve').filter((r) => r.kind === 'action').length;
	const facts = (w: number) => {
		const lines = [masterLine(curve, delta), fitLine(curve)];
		return (
			<>
				{lines.map((l) => (
					<Text key={l} wrap="truncate" {...theme.value}>
						{clip(l, w)}
					</Text>
				))}
				<Text wrap="truncate">{clip(reachText(curve), w)}</Text>
			</>
		);
	};
	if (layout.isWide) {
		// Title, three fact lines, the table, the actions, then the warnings in full below.
		const tableRows = Math.min(count + 1, height - 7 - actionCount);
		const room = Math.max(1, height - tableRows - 4 - actionCount);
		const full = curve.warnings.length
			? curve.warnings.flatMap((w) =>
					wrapWords(`${shortWarning(w, curve)[0] ?? '!'} ${w.message}`, width - 2).map((l, i) => (i ? `  ${l}` : l)),
				)
			: ['no warnings'];
		const shown = full.length <= room ? full : [...full.slice(0, room - 1), '… w shows every warning in full'];
		return (
			<Box flexDirection="column" width={width}>
				<Text wrap="truncate" {...theme.current}>
					{clip('5 Curve & save: the sliders to set for this patient', width)}
				</Text>
				{facts(width)}
				<SliderTable
					curve={curve}
					delta={delta}
					width={width}
					height={tableRows}
					cursor={slider}
					isFocused
					bankTrack={bankTrackFor(width)}
				/>
				<Actions state={state} width={width} />
				{shown.map((l, i) => (
					<Text key={i} wrap="truncate" {...(curve.warnings.length ? theme.warning : theme.muted)}>
						{clip(l, width)}
					</Text>
				))}
			</Box>
		);
	}
	const tableWidth = width - layout.plotWidth - 1;
	const warningRows = 3;
	const sideRows = height - warningRows;
	return (
		<Box flexDirection="column" width={width}>
			<Box flexDirection="row" width={width} height={sideRows}>
				{state.picture === 'off' ? (
					<PlotView
						curve={curve}
						width={layout.plotWidth}
						height={sideRows - 2}
						{...(slider >= 0 ? {selectedSlider: slider} : {})}
					/>
				) : state.picture === 'bank' ? (
					<BankView curve={curve} width={layout.plotWidth} height={sideRows} selected={slider} />
				) : (
					<PictureView curve={curve} kinds={[state.picture]} width={layout.plotWidth} height={sideRows - 2} />
				)}
				<Box width={1} />
				<Box flexDirection="column" width={tableWidth}>
					{facts(tableWidth)}
					<SliderTable
						curve={curve}
						delta={delta}
						width={tableWidth}
						height={Math.max(2, sideRows - 3 - actionCount)}
						cursor={slider}
						isFocused
					/>
					<Actions state={state} width={tableWidth} />
				</Box>
			</Box>
			<WarningLines curve={curve} width={width} maxLines={warningRows} />
		</Box>
	);
}
