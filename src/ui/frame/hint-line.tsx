/** The key hints for what the user is doing now, cut to the width but always ending in `? keys`. */
import {Text} from 'ink';
import {memo} from 'react';
import {hintsFor, type Mode} from '../state/key-intents.js';

/** A page of a mode with keys of its own (see `hintsFor`). */
type HintPage = Parameters<typeof hintsFor>[1];
import {useTheme} from '../kit/theme-context.js';

export interface HintLineProps {
	readonly mode: Mode;
	readonly width: number;
	readonly page?: HintPage;
}

export function hintText(mode: Mode, width: number, page?: HintPage): string {
	const hints = hintsFor(mode, page);
	const tail = hints.filter((h) => h.startsWith('? ') || h.startsWith('q '));
	const body = hints.filter((h) => !tail.includes(h));
	const sep = '  ';
	let out = '';
	const room = width - tail.join(sep).length - sep.length;
	for (const h of body) {
		const next = out ? out + sep + h : h;
		if (next.length > room) break;
		out = next;
	}
	return [out, ...tail].filter(Boolean).join(sep);
}

function HintLineView({mode, width, page}: HintLineProps) {
	const theme = useTheme();
	return (
		<Text wrap="truncate" {...theme.muted}>
			{hintText(mode, width, page)}
		</Text>
	);
}

/** Memoised: most of the frame does not change between key presses. */
export const HintLine = memo(HintLineView);
