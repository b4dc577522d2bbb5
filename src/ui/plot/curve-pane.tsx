/** The live curve beside the step (100 columns and wider): plot, master gain, reach, warnings. */
import {Box, Text} from 'ink';
import type {SettingsDelta} from '../../engine/plan-difference.js';
import type {CurveResult} from '../../engine/types.js';
import {signedDb} from '../../report/curve-summary.js';
import {masterText, reachText} from '../state/curve-facts.js';
import {sliderDeliveredDb} from '../kit/depth-plot.js';
import {PictureView} from '../picture/picture-view.js';
import type {PictureChoice} from '../state/console-state.js';
import {PlotView} from './plot-view.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';
import {WarningLines} from './warning-lines.js';

export interface CurvePaneProps {
	readonly curve: CurveResult;
	readonly delta: SettingsDelta | null;
	readonly width: number;
	readonly plotRows: number;
	readonly isFocused: boolean;
	/** Slider picked with the keys while the pane is focused (or on the curve step). */
	readonly slider: number;
	/** Plot only, no summary lines (the curve step shows those itself). */
	readonly isPlotOnly?: boolean;
	/** The simulated picture (both panels) in place of the plot. */
	readonly picture?: PictureChoice;
}

export function sliderReadout(curve: CurveResult, delta: SettingsDelta | null, k: number): string {
	const s = curve.fit.sliders[k];
	if (!s) return '';
	const total = sliderDeliveredDb(curve)[k]!;
	const vs = delta ? `, ${signedDb(delta.sliderDeltasDb[k]!)} vs usual` : '';
	return `slider ${k + 1} at ${s.depthCm.toFixed(1)} cm: ${signedDb(s.gainDb)} dB (gives ${total.toFixed(1)})${vs}`;
}

export function CurvePane({
	curve,
	delta,
	width,
	plotRows,
	isFocused,
	slider,
	isPlotOnly,
	picture = 'off',
}: CurvePaneProps) {
	const theme = useTheme();
	const title = isFocused ? '> Live curve: Up/Down pick a slider, Tab returns' : '  Live curve (Tab to look closer)';
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...(isFocused ? theme.current : theme.muted)}>
				{clip(title, width)}
			</Text>
			{picture === 'off' || picture === 'bank' ? (
				<PlotView
					curve={curve}
					width={width}
					height={plotRows}
					{...(isFocused || isPlotOnly ? {selectedSlider: slider} : {})}
				/>
			) : (
				// The plot adds its axis and legend lines to plotRows; the picture counts its own, so it gets them too.
				<PictureView curve={curve} kinds={['ramp', 'plan']} width={width} height={plotRows + 2} />
			)}
			{isPlotOnly ? null : (
				<>
					<Text wrap="truncate">
						{clip(isFocused ? sliderReadout(curve, delta, slider) : masterText(curve, delta), width)}
					</Text>
					<Text wrap="truncate">{clip(reachText(curve), width)}</Text>
					<WarningLines curve={curve} width={width} maxLines={3} />
				</>
			)}
		</Box>
	);
}
