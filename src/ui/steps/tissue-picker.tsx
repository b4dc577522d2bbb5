/**
 * `t` or Enter on Tissue: the library with each tissue's a0, n, c, rho, the source of the one under
 * the cursor, and a custom row. Typing narrows the list to the tissues whose name holds the words.
 */
import {Box, Text} from 'ink';
import type {Tissue} from '../../engine/types.js';
import {filteredTissues} from '../state/tissue-filter.js';
import {scrollWindow, wrapWords} from '../kit/layout.js';
import {useTheme} from '../kit/theme-context.js';
import {clip, padTo} from '../kit/text-fit.js';

export interface TissuePickerProps {
	readonly layer: number;
	readonly cursor: number;
	/** Words typed to narrow the list. */
	readonly filter?: string;
	readonly width: number;
	readonly height: number;
}

const customRow = 'Custom values (type all five)';

export function tissueLine(t: Tissue, width: number): string {
	const nameWidth = Math.max(12, Math.min(32, width - 36));
	return (
		`${padTo(t.label, nameWidth)} ${String(t.alphaDbPerCmMhz).padStart(7)} ${String(t.exponent).padStart(4)} ` +
		`${String(t.speedMps).padStart(6)} ${String(t.densityKgM3).padStart(6)}`
	);
}

export function TissuePicker({layer, cursor, filter = '', width, height}: TissuePickerProps) {
	const theme = useTheme();
	const list = filteredTissues(filter);
	const count = list.length + 1;
	const picked = list[cursor];
	const source = picked
		? wrapWords(`source: ${picked.source ?? 'none given'}`, width - 2).slice(0, 2)
		: ["Enter copies this layer's values as a custom tissue to edit."];
	const filterLine = filter
		? `Filter: [${filter}_]  ${list.length === 0 ? 'no tissue has these words; ' : ''}Backspace erases`
		: 'Type part of a name to narrow the list (liver, fat, muscle …)';
	const listRows = Math.max(3, height - 3 - source.length);
	const {start, end} = scrollWindow(count, cursor, listRows);
	const nameWidth = Math.max(12, Math.min(32, width - 36));
	const header =
		`  ${padTo('Tissue (a0 in dB/cm/MHz^n)', nameWidth)} ${'a0'.padStart(7)} ${'n'.padStart(4)} ` +
		`${'c m/s'.padStart(6)} ${'rho'.padStart(6)}`;
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.current}>
				{clip(
					`Tissue for layer ${layer + 1} (Enter picks, Esc keeps the current one)  ${start + 1}-${end} of ${count}`,
					width,
				)}
			</Text>
			<Text wrap="truncate" {...(filter ? theme.current : theme.muted)}>
				{clip(filterLine, width)}
			</Text>
			<Text wrap="truncate" {...theme.muted}>
				{clip(header, width)}
			</Text>
			{Array.from({length: end - start}, (_, k) => {
				const i = start + k;
				const t = list[i];
				const isSel = i === cursor;
				return (
					<Text key={i} wrap="truncate" {...(isSel ? theme.selected : {})}>
						{clip(`${isSel ? '>' : ' '} ${t ? tissueLine(t, width) : customRow}`, width)}
					</Text>
				);
			})}
			{source.map((l, i) => (
				<Text key={`s${i}`} wrap="truncate" {...theme.muted}>
					{clip(`  ${l}`, width)}
				</Text>
			))}
		</Box>
	);
}
