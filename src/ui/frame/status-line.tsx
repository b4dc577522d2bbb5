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
		return {
			text: `Save as preset, name: [${o.text}_]  ${o.isFresh ? `${freshHint}; ` : ''}Enter saves, Esc cancels`,
			tone: 'ask',
		};
	}
	if (o?.kind === 'path')
		return {
			text: `Export to folder: [${o.text}_]  Enter writes there, Esc cancels${o.isFresh ? `; ${freshHint}` : ''}`,
			tone: 'ask',
		};
	if (state.editing) {
		const hint = rangeHint(currentRow(state));
		// The fresh-field words go last: at 80 columns the range and Enter/Esc matter more.
		return {
			text: `Typing. ${hint ?? ''}. Enter applies, Esc cancels.${state.editing.isFresh ? ` ${capitalised(freshHint)}.` : ''}`,
			tone: 'info',
		};
	}
	if (state.sweep.isOpen && state.sweep.typing?.isFresh)
		return {text: `Thickness list: ${freshHint}. Enter applies, Esc cancels.`, tone: 'info'};
	if (state.notice) return {text: state.notice.text, tone: state.notice.tone};
	return {text: '', tone: 'info'};
}

/** Most lines a notice shown whole takes: its own, the key-hint line's, two from the bottom of the body. */
export const wholeNoticeMax = 4;

/**
 * Word wrap that also breaks a long path after a `/`, so a folder reads whole over two lines
 * instead of being cut; a piece longer than the width is cut only as a last resort.
 */
export function wrapAtBreaks(text: string, width: number): string[] {
	const w = Math.max(1, width);
	const lines: string[] = [];
	let line = '';
	for (let piece of text.split(/(?<=[ /])/)) {
		if ((line + piece).trimEnd().length <= w) {
			line += piece;
			continue;
		}
		if (line.trim()) lines.push(line.trimEnd());
		while (piece.trimEnd().length > w) {
			lines.push(piece.slice(0, w));
			piece = piece.slice(w);
		}
		line = piece;
	}
	if (line.trim()) lines.push(line.trimEnd());
	return lines.length ? lines : [''];
}

/** The status line's text as lines: one, cut to the width, unless a notice is to be read whole. */
export function statusLines(state: ConsoleState, width: number): string[] {
	const {text} = statusText(state);
	const o = state.overlay;
	// A long folder being typed: its end (where the typing is) stays in view, the start gives way.
	if (o?.kind === 'path' && text.length > width) {
		const head = 'Export to folder: [';
		const room = Math.max(1, width - head.length - 3);
		return [o.text.length + 2 <= width - head.length ? clip(text, width) : `${head}…${o.text.slice(-room)}_]`];
	}
	if (!state.notice?.isWhole || state.overlay || state.editing || text.length <= width)
		return [clip(text || ' ', width)];
	const lines = wrapAtBreaks(text, width);
	return lines.length <= wholeNoticeMax
		? lines
		: [...lines.slice(0, wholeNoticeMax - 1), clip(lines.slice(wholeNoticeMax - 1).join(''), width)];
}

export function StatusLine({state, width}: StatusLineProps) {
	const theme = useTheme();
	const {tone} = statusText(state);
	const style =
		tone === 'ask'
			? theme.current
			: tone === 'refusal'
				? theme.refusal
				: tone === 'done'
					? theme.done
					: tone === 'warning'
						? theme.warning
						: theme.muted;
	return (
		<>
			{statusLines(state, width).map((line, i) => (
				<Text key={`s${i}`} wrap="truncate" {...style}>
					{line}
				</Text>
			))}
		</>
	);
}
