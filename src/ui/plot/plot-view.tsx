/** Draws a depth plot; colour only repeats what the characters already say. */
import {Box, Text} from 'ink';
import {memo} from 'react';
import type {CurveResult} from '../../engine/types.js';
import {depthPlot, glyph} from '../kit/depth-plot.js';
import {styledText} from '../kit/styled-text.js';
import type {Theme} from '../kit/theme.js';
import {useTheme} from '../kit/theme-context.js';

export interface PlotViewProps {
	readonly curve: CurveResult;
	readonly width: number;
	readonly height: number;
	readonly selectedSlider?: number;
}

/** The style of a blank or label character: one object, so runs of them compare equal. */
const noStyle: Theme['plotCurve'] = {};

function styleOf(ch: string, theme: Theme) {
	switch (ch) {
		case glyph.curve:
			return theme.plotCurve;
		case glyph.band:
			return theme.plotBand;
		case glyph.slider:
		case glyph.selected:
			return theme.plotSlider;
		case glyph.noise:
			return theme.plotNoise;
		case glyph.blocked:
			return theme.plotBlocked;
		default:
			return noStyle;
	}
}

/** Splits the grid part of a row into runs of one style each (one run per row in the plain theme). */
export function styledRuns(grid: string, theme: Theme): {text: string; style: ReturnType<typeof styleOf>}[] {
	const out: {text: string; style: ReturnType<typeof styleOf>}[] = [];
	for (const ch of grid) {
		const style = styleOf(ch, theme);
		const last = out[out.length - 1];
		if (last && (last.style === style || (isPlain(last.style) && isPlain(style)))) last.text += ch;
		else out.push({text: ch, style});
	}
	return out;
}

const isPlain = (style: object) => Object.keys(style).length === 0;

function PlotViewImpl({curve, width, height, selectedSlider}: PlotViewProps) {
	const theme = useTheme();
	const plot = depthPlot(curve, {width, height, ...(selectedSlider === undefined ? {} : {selectedSlider})});
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.muted}>
				{plot.axis}
			</Text>
			{plot.rows.map((row, i) => {
				const a = row.indexOf('|');
				const b = row.indexOf('|', a + 1);
				// One text per row, its runs styled here (styled-text.ts).
				const runs = styledRuns(row.slice(a + 1, b), theme)
					.map((run) => styledText(run.text, run.style))
					.join('');
				return (
					<Text key={i} wrap="truncate">
						{styledText(row.slice(0, a + 1), theme.muted) + runs + styledText(row.slice(b), theme.muted)}
					</Text>
				);
			})}
			<Text wrap="truncate" {...theme.muted}>
				{plot.legend}
			</Text>
		</Box>
	);
}

/** Memoised: a cursor move or a notice redraws the frame, not the plot (the curve is kept until the plan changes). */
export const PlotView = memo(PlotViewImpl);
