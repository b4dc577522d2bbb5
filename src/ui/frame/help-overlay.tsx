/** `?`: every key of the one key table, by section, in two columns when they fit. */
import {Box, Text} from 'ink';
import {bindings, type Section} from '../state/key-intents.js';
import {useTheme} from '../kit/theme-context.js';
import {clip, padTo} from '../kit/text-fit.js';

export interface HelpOverlayProps {
	readonly width: number;
	readonly height: number;
}

// Ordered so the two columns split evenly (17 lines each at 80×24): getting about and the stack on the left,
// the plan and editing on the right.
const sectionOrder: readonly Section[] = [
	'Moving around',
	'Tissue stack',
	'Questions',
	'The plan',
	'Changing a value',
	'Typing a value',
];

type Line = {readonly text: string; readonly isHeading: boolean};

/** The overlay's lines, section by section, each key padded to one column. */
export function helpLines(columnWidth: number): Line[][] {
	return sectionOrder.map((section) => [
		{text: section, isHeading: true},
		...bindings
			.filter((b) => b.section === section)
			.map((b) => ({text: clip(`  ${padTo(b.keys, 13)} ${b.help}`, columnWidth), isHeading: false})),
	]);
}

/** Splits sections into two columns of about equal length (sections are never split). */
export function twoColumns(sections: Line[][]): [Line[], Line[]] {
	// The split point (between whole sections) that makes the longer column shortest.
	let best = 0;
	let bestHeight = Infinity;
	for (let k = 0; k <= sections.length; k++) {
		const left = sections.slice(0, k).reduce((n, s) => n + s.length, 0);
		const right = sections.slice(k).reduce((n, s) => n + s.length, 0);
		if (Math.max(left, right) < bestHeight) {
			bestHeight = Math.max(left, right);
			best = k;
		}
	}
	return [sections.slice(0, best).flat(), sections.slice(best).flat()];
}

export function HelpOverlay({width, height}: HelpOverlayProps) {
	const theme = useTheme();
	const isTwo = width >= 76;
	const colWidth = isTwo ? Math.floor((width - 2) / 2) : width;
	const sections = helpLines(colWidth);
	const [left, right] = isTwo ? twoColumns(sections) : [sections.flat(), []];
	const column = (lines: Line[]) => (
		<Box flexDirection="column" width={colWidth}>
			{lines.slice(0, height - 1).map((l, i) => (
				<Text key={i} wrap="truncate" {...(l.isHeading ? theme.current : {})}>
					{l.text}
				</Text>
			))}
		</Box>
	);
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.current}>
				{clip('Keys (Esc or ? closes this list)', width)}
			</Text>
			<Box flexDirection="row">
				{column(left)}
				{isTwo ? <Box width={2} /> : null}
				{isTwo ? column(right) : null}
			</Box>
		</Box>
	);
}
