/** One row of a step: a cursor mark, the label, the value (or what is being typed) and any refusal. */
import {Box, Text} from 'ink';
import {memo} from 'react';
import {wrapWords} from './layout.js';
import {useTheme} from './theme-context.js';
import {clip, padTo} from './text-fit.js';

/** Lines a refusal may take under its row when it does not fit beside it. */
export const refusalLines = 2;

export interface RowLineProps {
	readonly label: string;
	readonly value: string;
	readonly width: number;
	readonly isSelected: boolean;
	/** Text being typed into this row; shown with a `_` cursor instead of the value. */
	readonly typing?: string;
	readonly refusal?: string;
	/** Extra words after the value (deltas, notes). */
	readonly extra?: string;
	readonly labelWidth?: number;
}

function RowLineView({label, value, width, isSelected, typing, refusal, extra, labelWidth}: RowLineProps) {
	const theme = useTheme();
	// A row with no value (an action) may use the whole line for its words.
	const lw = value === '' && typing === undefined ? width - 3 : (labelWidth ?? Math.min(24, Math.floor(width * 0.48)));
	const mark = isSelected ? '>' : ' ';
	const shown = typing === undefined ? value : `[${typing}_]`;
	const padded = `${mark} ${padTo(label, lw)} `;
	const rest = clip(`${shown}${extra ? `  ${extra}` : ''}`, Math.max(0, width - padded.length));
	// Nothing after the label: no trailing blanks for Ink to tokenise.
	const head = rest === '' && refusal === undefined ? padded.trimEnd() : padded;
	const refusalText = refusal ? `  ! ${refusal}` : '';
	const isBeside = refusal !== undefined && head.length + rest.length + refusalText.length <= width;
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate">
				<Text {...(isSelected ? theme.selected : {})}>{head}</Text>
				<Text {...theme.value}>{rest}</Text>
				{isBeside ? <Text {...theme.refusal}>{refusalText}</Text> : null}
			</Text>
			{refusal !== undefined && !isBeside
				? wrapWords(`! ${refusal}`, width - 4)
						.slice(0, refusalLines)
						.map((l, i) => (
							<Text key={i} wrap="truncate" {...theme.refusal}>
								{`    ${l}`}
							</Text>
						))
				: null}
		</Box>
	);
}

/** Memoised: most of the frame does not change between key presses. */
export const RowLine = memo(RowLineView);
