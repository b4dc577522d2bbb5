/**
 * The slider bank on its own, where the plot stands on the narrow curve step (key p cycles to it):
 * below 100 columns there is no room for it beside the slider table. One track per slider with its
 * number and depth, skin at the top; the drawing is `sliderBank`'s.
 */
import {Box, Text} from 'ink';
import type {CurveResult} from '../../engine/types.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';
import {sliderBank} from './slider-bank.js';

export interface BankViewProps {
	readonly curve: CurveResult;
	readonly width: number;
	readonly height: number;
	/** The chosen slider (drawn `@`), or -1. */
	readonly selected: number;
}

/** Characters before a track: the slider's number and depth, ` 3  5.0 `. */
const labelWidth = 9;

export function BankView({curve, width, height, selected}: BankViewProps) {
	const theme = useTheme();
	const bank = sliderBank(curve, Math.min(31, width - labelWidth - 2), selected);
	const unit = curve.plan.scanner?.sliderTravelDb ? 'fractions of full travel' : 'dB offsets';
	const rows = bank.rows.map(
		(track, k) => `${String(k + 1).padStart(2)} ${curve.fit.sliders[k]!.depthCm.toFixed(1).padStart(5)} ${track}`,
	);
	const lines = [...rows.slice(0, Math.max(1, height - 3))];
	return (
		<Box flexDirection="column" width={width} height={height}>
			<Text wrap="truncate" {...theme.current}>
				{clip(`Sliders as a bank, ${unit} (p: next)`, width)}
			</Text>
			<Text wrap="truncate" {...theme.muted}>
				{clip(` # depth ${bank.header}`, width)}
			</Text>
			{lines.map((l, k) => (
				<Text key={`b${k}`} wrap="truncate" {...(k === selected ? theme.selected : {})}>
					{clip(l, width)}
				</Text>
			))}
		</Box>
	);
}
