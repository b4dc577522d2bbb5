/**
 * The protocol table as Markdown (GitHub-style pipe tables), for pasting into a department
 * document: a header with the inputs, the tissue values and their sources, the model version and
 * the caution line; then one row per combination; then the warning legend and the simplifications.
 */
import {modelVersion} from '../engine/compensation-curve.js';
import {cautionLine} from '../report/cautions.js';
import type {ProtocolTable, TableRow} from './sweep-runner.js';
import {
	fixed,
	habitusGroups,
	highestPerRow,
	inputLines,
	showsAngle,
	plain,
	rowWarningCodes,
	signed,
	sweptLayerLabel,
	warningCodesUsed,
	warningLegend,
	type TableFormatOptions,
} from './table-common.js';

/** Escapes text for one table cell or line: pipes, backslashes, HTML-ish brackets, line breaks. */
export function markdownText(s: string): string {
	return s
		.replace(/\\/g, '\\\\')
		.replace(/\|/g, '\\|')
		.replace(/</g, '&lt;')
		.replace(/>/g, '&gt;')
		.replace(/[*_`[\]]/g, (c) => `\\${c}`)
		.replace(/\r\n|\r|\n/g, ' ');
}

function tableLines(
	header: readonly string[],
	align: readonly ('l' | 'r')[],
	rows: readonly (readonly string[])[],
): string[] {
	const line = (cells: readonly string[]) => `| ${cells.join(' | ')} |`;
	return [line(header), line(align.map((a) => (a === 'r' ? '---:' : ':---'))), ...rows.map(line)];
}

/**
 * The columns that say which combination a row is: the swept layer, the frequency (left out in the
 * per-habitus table, whose rows span every frequency), the angle, the receive mode and each swap.
 */
function comboColumns(
	t: ProtocolTable,
	withFrequency: boolean,
): {header: string[]; align: ('l' | 'r')[]; cells: (row: TableRow) => string[]} {
	const s = t.sweep;
	const header: string[] = [];
	const align: ('l' | 'r')[] = [];
	const parts: ((row: TableRow) => string)[] = [];
	const column = (title: string, side: 'l' | 'r', cell: (row: TableRow) => string) => {
		header.push(title);
		align.push(side);
		parts.push(cell);
	};
	if (s.layerIndex !== null)
		column(`${markdownText(sweptLayerLabel(t) ?? 'Layer')} cm`, 'r', (r) => fixed(r.layerCm ?? 0, 1));
	if (withFrequency) column('MHz', 'r', (r) => plain(r.centerMhz));
	if (showsAngle(t)) column('Angle °', 'r', (r) => plain(r.angleDeg));
	column('Receive', 'l', (r) => r.receive);
	s.swaps.forEach((w, k) => column(`Layer ${w.layer}`, 'l', (r) => markdownText(r.swapLabels[k]!)));
	return {header, align, cells: (r) => parts.map((cell) => cell(r))};
}

/** Column headers and cells of the main table (exported for the console's scrolling view). */
export function markdownColumns(t: ProtocolTable): {
	header: string[];
	align: ('l' | 'r')[];
	cells: (row: TableRow) => string[];
} {
	const s = t.sweep;
	const combo = comboColumns(t, true);
	const header: string[] = ['#', ...combo.header];
	const align: ('l' | 'r')[] = ['r', ...combo.align];
	t.knotDepthsCm.forEach((d, k) => {
		header.push(`${s.delta ? 'Δ ' : ''}S${k + 1} @${fixed(d, 1)} cm`);
		align.push('r');
	});
	if (s.delta) {
		header.push('Δ master dB');
		align.push('r');
	}
	header.push('Master dB', 'Fit ± dB', 'Noise floor at cm');
	align.push('r', 'r', 'r');
	// The highest reaching frequency depends on the habitus, not on the row's frequency: in the main
	// table only when every habitus has one row, else once per habitus in a table of its own.
	const perRow = highestPerRow(t);
	if (perRow && s.targetFollowsLayer) {
		header.push('Target cm');
		align.push('r');
	}
	if (perRow) {
		header.push(s.targetFollowsLayer ? 'Highest MHz to target' : `Highest MHz to ${plain(s.targetDepthCm)} cm`);
		align.push('r');
	}
	header.push('Warnings');
	align.push('l');

	const beyond = `beyond ${plain(s.doc.display.depthCm)}`;
	const cells = (r: TableRow): string[] => {
		const out = [String(r.index), ...combo.cells(r)];
		if (r.delta) out.push(...r.delta.sliderDeltasDb.map((x) => signed(x, 1)), signed(r.delta.masterDeltaDb, 1));
		else out.push(...r.slidersDb.map((x) => signed(x, 1)));
		out.push(
			fixed(r.masterGainDb, 1),
			fixed(r.residualDb, 1),
			r.penetrationDepthCm === null ? beyond : fixed(r.penetrationDepthCm, 1),
		);
		if (perRow && s.targetFollowsLayer) out.push(fixed(r.targetDepthCm, 1));
		if (perRow) out.push(r.highestReachingMhz === null ? 'none' : plain(r.highestReachingMhz));
		out.push(rowWarningCodes(r).join(', ') || '–');
		return out;
	};
	return {header, align, cells};
}

/** One row per habitus (everything but the frequency): the highest reaching frequency once. */
function habitusLadderTable(t: ProtocolTable): string[] {
	const combo = comboColumns(t, false);
	const header = [...combo.header];
	const align = [...combo.align];
	header.push('Target cm', 'Highest MHz', 'Its noise floor at cm', 'Rows');
	align.push('r', 'r', 'r', 'l');
	const rows = habitusGroups(t).map((g) => {
		const r = g[0]!;
		const out = combo.cells(r);
		out.push(
			fixed(r.targetDepthCm, 1),
			r.highestReachingMhz === null ? 'none' : plain(r.highestReachingMhz),
			r.highestReachingPenetrationCm === null
				? r.highestReachingMhz === null
					? '–'
					: 'beyond 40'
				: fixed(r.highestReachingPenetrationCm, 1),
			g.map((x) => String(x.index)).join(', '),
		);
		return out;
	});
	return tableLines(header, align, rows);
}

export function tableMarkdown(t: ProtocolTable, o: TableFormatOptions = {}): string {
	return [...tableMarkdownChunks(t, o)].join('');
}

/** The Markdown text in pieces: the head, the rows a few hundred at a time, the notes. */
export function* tableMarkdownChunks(
	t: ProtocolTable,
	o: TableFormatOptions = {},
	rowsPerChunk = 500,
): Generator<string> {
	const s = t.sweep;
	const out: string[] = [];
	out.push(`# Depth-gain protocol table: ${markdownText(s.doc.name)}`);
	out.push('');
	out.push(`> **Caution:** ${markdownText(cautionLine)}`);
	out.push('');
	for (const [k, v] of inputLines(t, o)) out.push(`- **${markdownText(k)}:** ${markdownText(v)}`);
	out.push(`- **Model:** ${markdownText(modelVersion)}`);
	out.push('');

	out.push('## Tissues used');
	out.push('');
	const last = s.doc.layers.length - 1;
	out.push(
		...tableLines(
			['Where', 'Tissue', 'Thickness cm', 'c m/s', 'ρ kg/m³', 'α0 dB/cm/MHz^n, one way', 'n', 'Source'],
			['l', 'l', 'r', 'r', 'r', 'r', 'r', 'l'],
			t.tissues.map((u) => {
				const i = u.layer - 1;
				const thickness = u.swapped
					? 'as the layer'
					: i === last
						? 'rest'
						: i === s.layerIndex && s.fatSwept
							? 'swept'
							: plain(s.doc.layers[i]!.thicknessCm);
				const source = [u.tissue.source ?? 'no source recorded', u.from ? `taken from ${u.from}` : '']
					.filter(Boolean)
					.join('; ');
				return [
					u.where,
					markdownText(u.tissue.label),
					thickness,
					plain(u.tissue.speedMps),
					plain(u.tissue.densityKgM3),
					plain(u.tissue.alphaDbPerCmMhz),
					plain(u.tissue.exponent),
					markdownText(source),
				];
			}),
		),
	);
	out.push('');

	out.push(
		s.delta ? '## Starting settings (sliders and master as deltas from the standard habitus)' : '## Starting settings',
	);
	out.push('');
	const cols = markdownColumns(t);
	out.push(...tableLines(cols.header, cols.align, []));
	yield out.join('\n') + '\n';
	for (let i = 0; i < t.rows.length; i += rowsPerChunk) {
		yield tableLines(cols.header, cols.align, t.rows.slice(i, i + rowsPerChunk).map(cols.cells))
			.slice(2)
			.join('\n') + '\n';
	}
	out.length = 0;
	out.push('');
	out.push(
		`Sliders in dB at their knot depths (displayed cm)${s.delta ? ', as the row minus the standard habitus' : ''}; ` +
			'"Fit ± dB" is the worst gap between the fitted controls and the curve; "Noise floor at" ' +
			'is the displayed depth where the echo meets the noise floor.',
	);

	if (!highestPerRow(t)) {
		out.push('');
		out.push(`## Highest frequency reaching the target, per habitus`);
		out.push('');
		out.push(...habitusLadderTable(t));
	}

	const codes = warningCodesUsed(t.rows);
	if (codes.length) {
		out.push('');
		out.push('Warnings:');
		out.push('');
		for (const c of codes) out.push(`- \`${c}\`: ${markdownText(warningLegend[c])}`);
	}
	out.push('');
	out.push('Notes:');
	out.push('');
	for (const n of t.notes) out.push(`- ${markdownText(n)}`);
	out.push(`- ${markdownText(cautionLine)}`);
	yield out.join('\n') + '\n';
}
