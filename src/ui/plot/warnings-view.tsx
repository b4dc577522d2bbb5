/** `w`: every curve warning in full, then the cautions as far as they fit. */
import {Box, Text} from 'ink';
import type {CurveResult} from '../../engine/types.js';
import {bandScopeNote} from '../../engine/uncertainty-band.js';
import {cautions} from '../../report/cautions.js';
import {shortWarning} from '../state/curve-facts.js';
import {wrapWords} from '../kit/layout.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';

export interface WarningsViewProps {
	readonly curve: CurveResult;
	readonly width: number;
	readonly height: number;
}

export function warningsViewLines(
	curve: CurveResult,
	width: number,
	height: number,
): {text: string; tone: 'title' | 'warning' | 'plain'}[] {
	const out: {text: string; tone: 'title' | 'warning' | 'plain'}[] = [
		{text: 'Warnings in full (Esc closes)', tone: 'title'},
	];
	if (curve.warnings.length === 0) out.push({text: 'No warnings for this plan.', tone: 'plain'});
	for (const w of curve.warnings) {
		const mark = shortWarning(w, curve)[0] ?? '!';
		wrapWords(`${mark} ${w.message}`, width - 2).forEach((text, i) =>
			out.push({text: i === 0 ? text : `  ${text}`, tone: 'warning'}),
		);
	}
	// The plot's band (-): what it holds, said once in the console, here.
	wrapWords(`- ${bandScopeNote}`, width - 2).forEach((text, i) =>
		out.push({text: i === 0 ? text : `  ${text}`, tone: 'plain'}),
	);
	const room = height - out.length - 1;
	const cautionText = cautions.flatMap((c) => wrapWords(`- ${c}`, width));
	if (room > 1) {
		out.push({text: 'Cautions', tone: 'title'});
		out.push(...cautionText.slice(0, room - 1).map((text) => ({text, tone: 'plain' as const})));
	}
	return out.slice(0, height);
}

export function WarningsView({curve, width, height}: WarningsViewProps) {
	const theme = useTheme();
	const lines = warningsViewLines(curve, width, height);
	return (
		<Box flexDirection="column" width={width}>
			{lines.map((l, i) => (
				<Text
					key={i}
					wrap="truncate"
					{...(l.tone === 'title' ? theme.current : l.tone === 'warning' ? theme.warning : {})}
				>
					{clip(l.text, width)}
				</Text>
			))}
		</Box>
	);
}
