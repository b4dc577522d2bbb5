/**
 * The protocol table as CSV (RFC 4180: comma-separated, CRLF line ends, quotes where needed): one
 * header row, then one row per combination, nothing else, so a spreadsheet opens it directly. The
 * inputs, sources and cautions travel in the Markdown, JSON and SVG forms.
 *
 * No empty cells stand for a meaning: `penetration_cm` says `beyond display` when the echo stays
 * above the noise floor over the whole display, and `highest_reaching_mhz` says `none` when no ladder
 * frequency reaches the target depth. Every other cell of those columns is a number. The highest
 * reaching frequency repeats on each row of a habitus (one row per combination keeps the file
 * tidy for a spreadsheet); Markdown shows it once per habitus.
 */
import {stringify} from 'csv-stringify/sync';
import type {ProtocolTable, TableRow} from './sweep-runner.js';
import {roundTo} from '../plan/rounding.js';
import {
	depthDecimals,
	gainDecimals,
	mhzDecimals,
	residualDecimals,
	rowWarningCodes,
	showsAngle,
	type TextParts,
} from './table-common.js';

/** `penetration_cm` when the echo stays above the noise floor down to the display depth. */
export const beyondDisplay = 'beyond display';

/** The header row. */
export function csvHeader(t: ProtocolTable): string[] {
	const s = t.sweep;
	const h = ['row'];
	if (s.layerIndex !== null) h.push(`layer${s.layerIndex + 1}_cm`);
	h.push('center_mhz');
	if (showsAngle(t)) h.push('angle_deg');
	h.push('receive');
	for (const w of s.swaps) h.push(`layer${w.layer}_tissue`);
	t.knotDepthsCm.forEach((_, k) => h.push(s.delta ? `slider${k + 1}_delta_db` : `slider${k + 1}_db`));
	if (s.delta) h.push('master_delta_db');
	h.push('master_gain_db', 'residual_db', 'penetration_cm');
	if (s.targetFollowsLayer) h.push('target_cm');
	h.push('highest_reaching_mhz', 'warnings');
	return h;
}

/** One data row, as text cells. */
export function csvCells(t: ProtocolTable, r: TableRow): string[] {
	const s = t.sweep;
	const n = (x: number, d: number) => String(roundTo(x, d));
	const out = [String(r.index)];
	if (s.layerIndex !== null) out.push(r.layerCm === null ? '' : n(r.layerCm, depthDecimals));
	out.push(n(r.centerMhz, mhzDecimals));
	if (showsAngle(t)) out.push(n(r.angleDeg, 2));
	out.push(r.receive);
	out.push(...r.swapLabels);
	if (r.delta)
		out.push(...r.delta.sliderDeltasDb.map((x) => n(x, gainDecimals)), n(r.delta.masterDeltaDb, gainDecimals));
	else out.push(...r.slidersDb.map((x) => n(x, gainDecimals)));
	out.push(
		n(r.masterGainDb, gainDecimals),
		n(r.residualDb, residualDecimals),
		r.penetrationDepthCm === null ? beyondDisplay : n(r.penetrationDepthCm, depthDecimals),
	);
	if (s.targetFollowsLayer) out.push(n(r.targetDepthCm, depthDecimals));
	out.push(r.highestReachingMhz === null ? 'none' : n(r.highestReachingMhz, mhzDecimals), rowWarningCodes(r).join(' '));
	return out;
}

export function tableCsv(t: ProtocolTable): string {
	return stringify([csvHeader(t), ...t.rows.map((r) => csvCells(t, r))], {record_delimiter: '\r\n'});
}

/** The same text as {@link tableCsv} in parts, for rows written as they are computed (see TextParts). */
export function tableCsvParts(t: ProtocolTable): TextParts {
	return {
		head: stringify([csvHeader(t)], {record_delimiter: '\r\n'}),
		rows: (batch) =>
			stringify(
				batch.map((r) => csvCells(t, r)),
				{record_delimiter: '\r\n'},
			),
		end: () => '',
	};
}

/** The same text as {@link tableCsv} in pieces of `rowsPerChunk` rows. */
export function* tableCsvChunks(t: ProtocolTable, rowsPerChunk = 500): Generator<string> {
	const parts = tableCsvParts(t);
	yield parts.head;
	for (let i = 0; i < t.rows.length; i += rowsPerChunk) yield parts.rows(t.rows.slice(i, i + rowsPerChunk));
}
