/** The line above the key hints: a question, the preset name being typed, a field's range, or the last notice. */
import {Text} from 'ink';
import type {ConsoleState} from '../state/console-state.js';
import {rangeHint} from '../state/row-text.js';
import {currentRow} from '../state/step-rows.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';
import {freshHint} from '../state/text-entry.js';

const capitalised = (t: string) => t.charAt(0).toUpperCase() + t.slice(1);

export interface StatusLineProps {
	readonly state: ConsoleState;
	readonly width: number;
}

export function statusText(state: ConsoleState): {text: string; tone: 'ask' | 'refusal' | 'done' | 'warning' | 'info'} {
	const o = state.overlay;
	if (o?.kind === 'ask') return {text: `? ${o.question}`, tone: 'ask'};
	if (o?.kind === 'name') {
		if (o.error) return {text: `Save as preset, name: [${o.text}_]  ! ${o.error}`, tone: 'refusal'};
		return {text: `Save as preset, name: [${o.text}_]  ${o.isFresh ? `${freshHint}; ` : ''}Enter saves, Esc cancels`, tone: 'ask'};
	}
	if (o?.kind === 'path') return {text: `Export to folder: [${o.text}_]  Enter writes there, Esc cancels${o.isFresh ? `; ${freshHint}` : ''}`, tone: 'ask'};
	if (state.editing) {
		const hint = rangeHint(currentRow(state));
		// The fresh-field words go last: at 80 columns the range and Enter/Esc matter more.
		return {text: `Typing. ${hint ?? ''}. Enter applies, Esc cancels.${state.editing.isFresh ? ` ${capitalised(freshHint)}.` : ''}`, tone: 'info'};
	}
	if (state.sweep.isOpen && state.sweep.typing?.isFresh) return {text: `Thickness list: ${freshHint}. Enter applies, Esc cancels.`, tone: 'info'};
	if (state.notice) return {text: state.notice.text, tone: state.notice.tone};
	return {text: '', tone: 'info'};
}

export function StatusLine({state, width}: StatusLineProps) {
	const theme = useTheme();
	const {text, tone} = statusText(state);
	const style = tone === 'ask' ? theme.current : tone === 'refusal' ? theme.refusal : tone === 'done' ? theme.done : tone === 'warning' ? theme.warning : theme.muted;
	return (
		<Text wrap="truncate" {...style}>
			{clip(text || ' ', width)}
		</Text>
	);
}
