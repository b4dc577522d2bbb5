/** The line of steps at the top: the current one in brackets (and styled), each with its digit. */
import {Text} from 'ink';
import {memo} from 'react';
import {stepIds, stepTitles, type StepId} from '../state/console-state.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';

export interface StepBarProps {
	readonly step: StepId;
	readonly width: number;
	readonly isDirty: boolean;
}

/** Shown after the steps while the plan has changes not saved as a preset. */
const dirtyMark = ' *changed';

export function stepBarParts(step: StepId, width: number, isDirty = false): {text: string; isCurrent: boolean}[] {
	const long = stepIds.map((id, i) => ({text: `${i + 1} ${stepTitles[id].title}`, isCurrent: id === step}));
	const total = long.reduce((n, p) => n + p.text.length + 2, 0) + 'evenecho '.length + (isDirty ? dirtyMark.length : 0);
	const parts =
		total <= width
			? long
			: stepIds.map((id, i) => ({
					text: `${i + 1} ${id === step ? stepTitles[id].title : stepTitles[id].short}`,
					isCurrent: id === step,
				}));
	return parts.map((p) => ({...p, text: p.isCurrent ? `[${p.text}]` : ` ${p.text} `}));
}

function StepBarView({step, width, isDirty}: StepBarProps) {
	const theme = useTheme();
	const parts = stepBarParts(step, width, isDirty);
	const mark = isDirty ? dirtyMark : '';
	return (
		<Text wrap="truncate">
			<Text {...theme.muted}>evenecho </Text>
			{parts.map((p) => (
				<Text key={p.text} {...(p.isCurrent ? theme.current : theme.muted)}>
					{p.text}
				</Text>
			))}
			<Text {...theme.warning}>{clip(mark, width)}</Text>
		</Text>
	);
}

/** Memoised: most of the frame does not change between key presses. */
export const StepBar = memo(StepBarView);
