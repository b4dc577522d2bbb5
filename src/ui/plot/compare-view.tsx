/**
 * Two plans side by side (key v): this patient on the left; on the right the starting plan it came
 * from (the region's usual template, or the saved preset it was loaded from), or with ← → any
 * template or saved preset; each with its curve, master gain, reach and slider table, and under
 * both what this patient changes.
 */
import {Box, Text} from 'ink';
import {settingsDelta, settingsOf, type SettingsDelta} from '../../engine/plan-difference.js';
import type {CurveResult} from '../../engine/types.js';
import {signedDb} from '../../report/curve-summary.js';
import {masterLine, reachText} from '../state/curve-facts.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';
import {PlotView} from './plot-view.js';
import {SliderTable} from './slider-table.js';

export interface CompareViewProps {
	readonly curve: CurveResult;
	readonly other: CurveResult | string;
	readonly thisName: string;
	readonly otherName: string;
	/** What the other plan is: "Starting plan", "Template", "Saved preset". */
	readonly otherTitle?: string;
	readonly width: number;
	readonly height: number;
}

/** "this patient vs …: master +1.2 dB; sliders +0.4 +0.8 …", or why there is no such line. */
export function changeLine(curve: CurveResult, other: CurveResult): string {
	if (curve.fit.sliders.length !== other.fit.sliders.length)
		return 'The two plans have different slider counts: compare the tables by depth.';
	const d: SettingsDelta = settingsDelta(settingsOf(curve.fit), settingsOf(other.fit));
	return (
		`This patient minus the other: master ${signedDb(d.masterDeltaDb)} dB; sliders ` +
		`${d.sliderDeltasDb.map((x) => signedDb(x)).join(' ')}`
	);
}

function Side({
	curve,
	title,
	width,
	plotRows,
}: {
	readonly curve: CurveResult;
	readonly title: string;
	readonly width: number;
	readonly plotRows: number;
}) {
	const theme = useTheme();
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.current}>
				{clip(title, width)}
			</Text>
			<PlotView curve={curve} width={width} height={plotRows} />
			<Text wrap="truncate" {...theme.value}>
				{clip(`${masterLine(curve, null)}  ${reachText(curve)}`, width)}
			</Text>
			<SliderTable
				curve={curve}
				delta={null}
				width={width}
				height={curve.fit.sliders.length + 1}
				cursor={-1}
				isFocused={false}
			/>
		</Box>
	);
}

export function CompareView({
	curve,
	other,
	thisName,
	otherName,
	otherTitle = 'Starting plan',
	width,
	height,
}: CompareViewProps) {
	const theme = useTheme();
	const half = Math.floor((width - 1) / 2);
	const sliders = Math.max(curve.fit.sliders.length, typeof other === 'string' ? 0 : other.fit.sliders.length);
	// Title, axis, legend, master and reach, the table with its header; then the change line
	// (Esc is on the hint line). At 80×24 that leaves the plot four rows.
	const plotRows = Math.max(3, height - (sliders + 1) - 4 - 1);
	return (
		<Box flexDirection="column" width={width}>
			<Box flexDirection="row" width={width}>
				<Side curve={curve} title={`This patient: ${thisName}`} width={half} plotRows={plotRows} />
				<Box width={1} />
				{typeof other === 'string' ? (
					<Text wrap="wrap">{clip(other, half)}</Text>
				) : (
					<Side curve={other} title={`${otherTitle} (←→): ${otherName}`} width={half} plotRows={plotRows} />
				)}
			</Box>
			<Text wrap="truncate" {...theme.value}>
				{clip(typeof other === 'string' ? '' : changeLine(curve, other), width)}
			</Text>
		</Box>
	);
}
