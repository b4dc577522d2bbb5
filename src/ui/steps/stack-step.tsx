/** Step 2: the tissue layers from the skin down, or one layer's own form when it is open. */
import {Box, Text} from 'ink';
import {FieldList, windowNote} from './field-list.js';
import {wrapWords} from '../kit/layout.js';
import {rowText, tissueNumbers, tissueOf} from '../state/row-text.js';
import type {StepProps} from './start-step.js';
import {rowsOf, type Row} from '../state/step-rows.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';

/** What the stack's columns and marks mean. */
export const stackLegend =
	'units: cm; a0 dB/cm/MHz^n, c m/s, rho kg/m³. screen: thickness as measured on the screen, ' +
	'true: real thickness (m switches); +: the last layer goes on below the display';

/** Narrowest pane that shows a0 and n beside each layer (they take about 32 characters with the thickness). */
const numbersFrom = 62;

/** Label column of the stack: up to 30 characters, narrowed so a0 and n fit when the pane can show them. */
export function stackLabelWidth(width: number): number {
	return width >= numbersFrom ? Math.min(30, width - 36) : Math.min(30, Math.floor(width * 0.55));
}

export function StackStep({state, width, height, isFocused}: StepProps) {
	const theme = useTheme();
	const rows = rowsOf(state, 'stack');
	const cursor = state.cursors.stack;
	const open = state.openLayer;
	// The tissue under the cursor (or of the open layer), with its values and where they come from.
	const focusLayer = open ?? (rows[cursor]?.kind === 'layer' ? (rows[cursor] as Row & {kind: 'layer'}).index : null);
	const tissue = focusLayer === null ? undefined : tissueOf(state.doc, focusLayer);
	// The source gets whatever lines the list leaves free (at least one, at most five).
	const sourceLines = Math.max(1, Math.min(5, height - rows.length - 6));
	const detail = tissue
		? [
				clip(`${tissue.label}: ${tissueNumbers(tissue)}`, width),
				...wrapWords(`source: ${tissue.source ?? 'none given'}`, width).slice(0, sourceLines),
			]
		: [];
	const legend = open === null ? wrapWords(stackLegend, width - 2).map((l) => `  ${l}`) : [];
	const lines = height - 1 - detail.length - legend.length;
	const note = windowNote(state, rows, cursor, lines);
	const title =
		open === null
			? `2 Tissue stack, skin at the top${note || ' (Enter opens a layer)'}`
			: `2 Tissue stack > layer ${open + 1} of ${state.doc.layers.length} (Esc back to the stack)${note}`;
	const extra = (row: Row) => {
		if (row.kind !== 'layer' || width < numbersFrom) return undefined;
		const t = tissueOf(state.doc, row.index);
		// One column for a0 and n whatever the thickness text ("20.0 cm screen +" is the longest).
		const pad = ' '.repeat(Math.max(0, 16 - rowText(state, row).value.length));
		return t ? `${pad}a0 ${t.alphaDbPerCmMhz} n ${t.exponent}` : undefined;
	};
	return (
		<Box flexDirection="column" width={width}>
			<Text wrap="truncate" {...theme.current}>
				{clip(title, width)}
			</Text>
			<FieldList
				state={state}
				rows={rows}
				cursor={cursor}
				width={width}
				height={lines}
				isFocused={isFocused}
				extra={extra}
				labelWidth={stackLabelWidth(width)}
			/>
			{legend.map((l, i) => (
				<Text key={`legend-${i}`} wrap="truncate" {...theme.muted}>
					{l}
				</Text>
			))}
			{detail.map((d, i) => (
				<Text key={i} wrap="truncate" {...theme.muted}>
					{d}
				</Text>
			))}
		</Box>
	);
}
