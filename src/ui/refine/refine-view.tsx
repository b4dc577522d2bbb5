/**
 * "Refine from an image" on step 5: the form that names the patient's still, then what was
 * measured — the still drawn small with the measured columns and the masked areas, the band levels
 * against the plan, the change per slider and for the master, the measured α0 with its interval —
 * and the cautions. Keys come through the console's one key table (a accepts, Esc discards).
 */
import {Box, Text} from 'ink';
import {useMemo} from 'react';
import type {RefineResult} from '../../analysis/refine-image.js';
import {refineCautions} from '../../report/refine-report.js';
import {wrapWords} from '../kit/layout.js';
import {clip} from '../kit/text-fit.js';
import {useTheme} from '../kit/theme-context.js';
import type {RefinePanel} from '../state/refine-state.js';
import {bandGlyph, bandPlot} from './band-plot.js';
import {maskedGlyph, refineThumbnail} from './refine-thumbnail.js';

export interface RefineViewProps {
	readonly panel: Exclude<RefinePanel, {phase: 'closed'}>;
	readonly width: number;
	readonly height: number;
}

const signed = (x: number, digits = 1) => `${x >= 0 ? '+' : '−'}${Math.abs(x).toFixed(digits)}`;

function PickForm({panel, width}: {readonly panel: RefinePanel & {phase: 'pick' | 'working'}; readonly width: number}) {
	const theme = useTheme();
	const field = (label: string, text: string, isActive: boolean) => (
		<Text wrap="truncate">
			<Text {...theme.muted}>{label}</Text>
			<Text {...(isActive ? theme.selected : theme.value)}>
				{clip(`${text}${isActive ? '▏' : ''}`, width - label.length)}
			</Text>
		</Text>
	);
	const isPick = panel.phase === 'pick';
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.current}>
				{clip('Refine from an image of this patient', width)}
			</Text>
			<Text wrap="truncate" {...theme.muted}>
				{clip("A still exported from the scanner (DICOM or PNG), taken with this plan's sliders and master.", width)}
			</Text>
			<Text> </Text>
			{field('Image file  ', panel.path, isPick && panel.field === 'path')}
			{field(
				'Frame       ',
				panel.frame === '' && !(isPick && panel.field === 'frame') ? '(first)' : panel.frame,
				isPick && panel.field === 'frame',
			)}
			{field(
				'Settings    ',
				panel.settings === '' && !(isPick && panel.field === 'settings')
					? "(none: the plan's own sliders and master)"
					: panel.settings,
				isPick && panel.field === 'settings',
			)}
			<Text> </Text>
			{panel.phase === 'working' ? (
				<Text wrap="truncate" {...theme.done}>
					{clip(`Measuring ${panel.path}…`, width)}
				</Text>
			) : panel.error ? (
				wrapWords(`Not measured: ${panel.error}`, width).map((l, i) => (
					<Text key={i} wrap="truncate" {...theme.refusal}>
						{l}
					</Text>
				))
			) : (
				<Text wrap="truncate" {...theme.muted}>
					{clip(
						'Enter measures it; Tab: next field (frame, settings file {sliders, masterGainDb}); Esc closes.',
						width,
					)}
				</Text>
			)}
			<Text> </Text>
			{wrapWords(`${refineCautions[0]} ${refineCautions[1]}`, width).map((l, i) => (
				<Text key={`c${i}`} wrap="truncate" {...theme.caution}>
					{l}
				</Text>
			))}
		</Box>
	);
}

/** Changes as a small table: a column per slider and one for the master; rows dB and, with a profile, travel. */
function sliderLines(r: RefineResult, width: number): string[] {
	const hasTravel = r.sliders.some((s) => s.correctionTravel !== null);
	const cell = 6;
	const columns = [
		...r.sliders.map((s, k) => ({
			head: String(k + 1),
			db: signed(s.correctionDb),
			travel: s.correctionTravel === null ? '' : signed(s.correctionTravel, 2),
		})),
		{head: 'master', db: signed(r.masterCorrectionDb), travel: ''},
	];
	const perLine = Math.max(1, Math.floor((width - 7) / cell));
	const lines: string[] = [];
	for (let k = 0; k < columns.length; k += perLine) {
		const part = columns.slice(k, k + perLine);
		const row = (label: string, pick: (c: (typeof columns)[number]) => string) =>
			`${label.padEnd(7)}${part
				.map((c) =>
					pick(c)
						.padStart(cell - 1)
						.padEnd(cell),
				)
				.join('')}`;
		lines.push(
			row(k === 0 ? 'slider' : '', (c) => c.head),
			row('dB', (c) => c.db),
		);
		if (hasTravel) lines.push(row('travel', (c) => c.travel));
	}
	return lines;
}

function Shown({
	panel,
	width,
	height,
}: {
	readonly panel: RefinePanel & {phase: 'shown'};
	readonly width: number;
	readonly height: number;
}) {
	const theme = useTheme();
	const r = panel.result;
	const thumbWidth = Math.max(16, Math.min(40, Math.floor(width * 0.34)));
	const rightWidth = width - thumbWidth - 2;
	const cautionLines = wrapWords(`${refineCautions[0]} ${refineCautions[1]}`, thumbWidth);
	const thumbRows = Math.max(6, height - 2 - cautionLines.length);
	const thumb = useMemo(
		() => refineThumbnail(panel.still, r.mask, thumbWidth, thumbRows),
		[panel.still, r.mask, thumbWidth, thumbRows],
	);
	const a = r.attenuation;
	const alphaLine = a
		? `Layer ${a.layerIndex + 1} ${a.label}: α0 ${a.alphaDbPerCmMhz.toFixed(2)} dB/cm/MHz, 95 % ` +
			`${a.low.toFixed(2)}–${a.high.toFixed(2)} (plan ${a.planAlphaDbPerCmMhz})`
		: `α0 not measured: ${r.cannotTell ?? ''}`;
	const sliders = sliderLines(r, rightWidth);
	const notes = r.warnings.filter(
		(w) => w.code === 'uncalibrated' || w.code === 'model-leftover' || w.code === 'slider-range-exceeded',
	);
	const noteLines = notes
		.flatMap((w) => wrapWords(w.code === 'uncalibrated' ? w.message.split('. ')[0]! + '.' : w.message, rightWidth))
		.slice(0, 2);
	const plotRows = Math.max(6, height - 3 - sliders.length - noteLines.length);
	const plot = bandPlot(r, rightWidth, plotRows);
	return (
		<Box flexDirection="row" width={width}>
			<Box flexDirection="column" width={thumbWidth}>
				<Text wrap="truncate" {...theme.current}>
					{clip(panel.path.split('/').pop() ?? panel.path, thumbWidth)}
				</Text>
				{thumb.map((l, i) => (
					<Text key={i} wrap="truncate">
						{l}
					</Text>
				))}
				<Text wrap="truncate" {...theme.muted}>
					{clip(`: measured  ${maskedGlyph} left out`, thumbWidth)}
				</Text>
				{cautionLines.map((l, i) => (
					<Text key={`c${i}`} wrap="truncate" {...theme.caution}>
						{l}
					</Text>
				))}
			</Box>
			<Box width={2} />
			<Box flexDirection="column" width={rightWidth}>
				<Text wrap="truncate" {...theme.current}>
					{clip(
						`${r.levelMap.calibrated ? 'Calibrated' : 'UNCALIBRATED'}: ${bandGlyph.measured} measured ${bandGlyph.unusable} ` +
							`unusable ${bandGlyph.expected} plan`,
						rightWidth,
					)}
				</Text>
				{plot.map((l, i) => (
					<Text key={i} wrap="truncate" {...theme.value}>
						{l}
					</Text>
				))}
				<Text wrap="truncate" {...(a ? theme.done : theme.warning)}>
					{clip(alphaLine, rightWidth)}
				</Text>
				{sliders.map((l, i) => (
					<Text key={`s${i}`} wrap="truncate">
						{clip(l, rightWidth)}
					</Text>
				))}
				{noteLines.map((l, i) => (
					<Text key={`n${i}`} wrap="truncate" {...theme.warning}>
						{l}
					</Text>
				))}
				<Text wrap="truncate" {...theme.muted}>
					{clip(
						a ? 'a: α0 into the plan (u undoes)  Esc: discard  Enter: another' : 'Esc: discard  Enter: another image',
						rightWidth,
					)}
				</Text>
			</Box>
		</Box>
	);
}

export function RefineView({panel, width, height}: RefineViewProps) {
	if (panel.phase === 'shown') return <Shown panel={panel} width={width} height={height} />;
	return <PickForm panel={panel} width={width} />;
}
