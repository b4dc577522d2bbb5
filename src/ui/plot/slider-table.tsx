/** The fitted sliders: knot depth, slider value, the compensation the controls give there, and the change from the usual. */
import {Box, Text} from 'ink';
import type {SettingsDelta} from '../../engine/plan-difference.js';
import type {CurveResult} from '../../engine/types.js';
import {signedDb, travelFractionText} from '../../report/curve-summary.js';
import {sliderDeliveredDb} from '../kit/depth-plot.js';
import {scrollWindow} from '../kit/layout.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';
import {sliderBank} from './slider-bank.js';

export interface SliderTableProps {
	readonly curve: CurveResult;
	readonly delta: SettingsDelta | null;
	readonly width: number;
	/** Lines for the header and the slider rows together. */
	readonly height: number;
	/** Selected slider, or -1 for none. */
	readonly cursor: number;
	readonly isFocused: boolean;
	/** Draw the slider bank beside the rows when this many track cells fit (0: no bank). */
	readonly bankTrack?: number;
}

/** Characters a slider row takes before the bank: cursor mark and the five columns. */
export const sliderRowWidth = 35;

/** Track cells the bank gets beside the table in `width` columns: up to 21, none below 7. */
export function bankTrackFor(width: number): number {
	const room = Math.min(21, width - sliderRowWidth - 4);
	return room >= 7 ? room : 0;
}

export function sliderRows(curve: CurveResult, delta: SettingsDelta | null): string[] {
	const totals = sliderDeliveredDb(curve);
	// With a measured scanner, each slider also as a fraction of its measured full travel.
	const travel = curve.plan.scanner?.sliderTravelDb ?? null;
	return curve.fit.sliders.map((s, k) => {
		const vs = delta ? signedDb(delta.sliderDeltasDb[k]!).padStart(7) : '      -';
		const ofTravel = travel ? ` ${travelFractionText(s.gainDb / travel).padStart(6)}` : '';
		return (
			`${String(k + 1).padStart(2)} ${s.depthCm.toFixed(1).padStart(5)} ${signedDb(s.gainDb).padStart(6)} ` +
			`${totals[k]!.toFixed(1).padStart(6)} ${vs}${ofTravel}`
		);
	});
}

export const sliderHeader = ' # depth slider   comp vs usual';

/** The header, with the travel column when the plan names a measured scanner with a travel. */
export function sliderHeaderFor(curve: CurveResult): string {
	return curve.plan.scanner?.sliderTravelDb ? `${sliderHeader} travel` : sliderHeader;
}

export function SliderTable({curve, delta, width, height, cursor, isFocused, bankTrack = 0}: SliderTableProps) {
	const theme = useTheme();
	const bank = bankTrack > 0 ? sliderBank(curve, bankTrack, isFocused ? cursor : -1) : null;
	// The travel column (a measured scanner) widens every row by the same 7 characters.
	const rowWidth = sliderRowWidth + (curve.plan.scanner?.sliderTravelDb ? 7 : 0);
	const beside = (text: string, extra: string | undefined) =>
		bank && extra !== undefined ? `${text.padEnd(rowWidth)}  ${extra}` : text;
	const lines = sliderRows(curve, delta);
	const {start, end} = scrollWindow(lines.length, Math.max(0, cursor), Math.max(1, height - 1));
	const more = start > 0 || end < lines.length ? ` (${start + 1}-${end} of ${lines.length})` : '';
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.muted}>
				{clip(beside(`  ${sliderHeaderFor(curve)}${more}`, bank?.header), width)}
			</Text>
			{lines.slice(start, end).map((line, k) => {
				const i = start + k;
				const isSel = isFocused && i === cursor;
				return (
					<Text key={i} wrap="truncate" {...(isSel ? theme.selected : {})}>
						{clip(beside(`${isSel ? '>' : ' '} ${line}`, bank?.rows[i]), width)}
					</Text>
				);
			})}
		</Box>
	);
}
