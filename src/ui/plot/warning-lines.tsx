/** Curve warnings, short: each starts with its plot character so colour is never the only cue. */
import {Box, Text} from 'ink';
import type {CurveResult} from '../../engine/types.js';
import {shortWarning} from '../state/curve-facts.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';

export interface WarningLinesProps {
	readonly curve: CurveResult;
	readonly width: number;
	readonly maxLines: number;
}

export function warningLines(curve: CurveResult, maxLines: number): string[] {
	if (curve.warnings.length === 0) return ['no warnings'];
	const all = curve.warnings.map((w) => shortWarning(w, curve));
	if (all.length <= maxLines) return all;
	return [...all.slice(0, maxLines - 1), `+${all.length - maxLines + 1} more (w reads them all)`];
}

export function WarningLines({curve, width, maxLines}: WarningLinesProps) {
	const theme = useTheme();
	const lines = warningLines(curve, maxLines);
	return (
		<Box flexDirection="column" width={width}>
			{lines.map((l, i) => (
				<Text key={i} wrap="truncate" {...(curve.warnings.length ? theme.warning : theme.muted)}>
					{clip(l, width)}
				</Text>
			))}
		</Box>
	);
}
