/** The caution, on every screen: a starting point only, receive gain before output, local protocols decide. */
import {Box, Text} from 'ink';
import {memo} from 'react';
import {cautionLine} from '../../report/cautions.js';
import {wrapWords} from '../kit/layout.js';
import {useTheme} from '../kit/theme-context.js';

function CautionLineView({width}: {readonly width: number}) {
	const theme = useTheme();
	return (
		<Box flexDirection="column" width={width}>
			{wrapWords(cautionLine, width).map((l, i) => (
				<Text key={i} wrap="truncate" {...theme.caution}>
					{l}
				</Text>
			))}
		</Box>
	);
}

/** Memoised: most of the frame does not change between key presses. */
export const CautionLine = memo(CautionLineView);
