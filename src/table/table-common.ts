/**
 * What the table formats share: rounding (fixed decimals, so output is byte-identical run to run),
 * labels, the warning legend and the input description.
 */
import type {WarningCode} from '../engine/types.js';
import {roundTo} from '../plan/rounding.js';
import {resolveTissue} from '../plan/plan-schema.js';
import type {ReceiveMode} from './sweep-spec.js';
import type {ProtocolTable, TableRow} from './sweep-runner.js';

/** A table's text in parts: the head, each batch of rows as they come (in row order), the end. */
export interface TextParts {
	readonly head: string;
	rows(batch: readonly TableRow[]): string;
	end(): string;
}

/** Options every formatter accepts. */
export interface TableFormatOptions {
	/** How the plan was given, e.g. `preset "upper-abdomen"` or `plan file liver.json`. */
	readonly source?: string;
	/** An ISO time to print; omitted by default so output is reproducible. */
	readonly generatedAt?: string;
}

/** Decimals in JSON and CSV: the same as `evenecho curve --format json`. */
export const gainDecimals = 2;
export const depthDecimals = 3;
export const residualDecimals = 3;
export const mhzDecimals = 3;

/** Fixed-decimal text; never "-0.0". */
export function fixed(x: number, decimals: number): string {
	return roundTo(x, decimals).toFixed(decimals);
}

/** Signed fixed-decimal text, ASCII: "+3.2", "-1.0", "+0.0". */
export function signed(x: number, decimals: number): string {
	const v = roundTo(x, decimals);
	return `${v < 0 ? '-' : '+'}${Math.abs(v).toFixed(decimals)}`;
}

/** A number as short text: 2.5, 3, 0.75 (for inputs the user typed). */
export function plain(x: number): string {
	return String(roundTo(x, 6));
}

export function receiveLabel(r: ReceiveMode): string {
	return r;
}

/** What the warning codes in a table mean (our wording). */
export const warningLegend: Record<WarningCode, string> = {
	'strong-reflector': 'a boundary reflects most of the beam: no useful echoes beyond it; gain is held flat there',
	'strong-absorber': 'a layer absorbs so strongly that no useful echoes come from beyond it; gain is held flat there',
	'below-noise-floor': 'the echo falls below the noise floor within the display: gain there lifts noise, not signal',
	'slider-range-exceeded':
		'sliders and master gain cannot follow the curve to within 2 dB: the slider or master range is too narrow',
	'speed-mismatch':
		"a layer's speed of sound differs from the assumed speed by over 3 %: it is drawn thicker or thinner than it is",
	'harmonic-simplified':
		'harmonic receive: tissue harmonic with plane-wave build-up from 1 cm, ' +
		'or a scatterer harmonic out at f0 and back at 2·f0 (see the notes)',
	'thick-body-wall':
		'over 3 cm of fat under the skin: depth and reach change, the slider shape barely does; gain cannot fix body-wall clutter',
	'refraction-shift': 'an oblique beam bends at the boundaries: deep targets are drawn sideways of where they are',
	'budget-receive-mismatch':
		"the noise budget was measured or stated for another receive mode than the row's: its reach is not calibrated",
	'scanner-profile':
		"the scanner's depth gain was measured from phantom images (a scanner profile) and replaces the assumed ramp",
};

/** Distinct warning codes in a table, in the legend's order. */
export function warningCodesUsed(rows: readonly TableRow[]): WarningCode[] {
	const used = new Set<WarningCode>();
	for (const r of rows) for (const w of r.warnings) used.add(w.code);
	return (Object.keys(warningLegend) as WarningCode[]).filter((c) => used.has(c));
}

/** Distinct warning codes of one row, in order of appearance. */
export function rowWarningCodes(row: TableRow): WarningCode[] {
	return [...new Set(row.warnings.map((w) => w.code))];
}

/** The plan's own tissue in the swept layer (read from the plan: the tissue list skips swapped layers). */
export function sweptLayerLabel(t: ProtocolTable): string | null {
	const i = t.sweep.layerIndex;
	return i === null ? null : resolveTissue(t.sweep.doc.layers[i]!.tissue).label;
}

/** "1, 2, 4 cm". */
export function list(values: readonly number[], unit: string): string {
	return `${values.map(plain).join(', ')}${unit ? ` ${unit}` : ''}`;
}

/** True when every row has the same noise budget. */
export function sharedNoiseBudget(t: ProtocolTable): number | null {
	const first = t.rows[0]?.noiseBudgetDb;
	if (first === undefined) return null;
	return t.rows.every((r) => r.noiseBudgetDb === first) ? first : null;
}

/** The inputs as label/value lines, for the Markdown header and the SVG footer. */
export function inputLines(t: ProtocolTable, o: TableFormatOptions = {}): [string, string][] {
	const s = t.sweep;
	const doc = s.doc;
	const out: [string, string][] = [];
	out.push(['Plan', `${o.source ? `${o.source}: ` : ''}"${doc.name}", region ${doc.region}`]);
	const label = sweptLayerLabel(t);
	if (s.layerIndex !== null && label !== null) {
		const own = doc.layers[s.layerIndex]!.thicknessCm;
		out.push([
			'Habitus',
			s.fatSwept
				? `layer ${s.layerIndex + 1} (${label}) at ${list(s.fatCm, 'cm')}; the plan has ${plain(own)} cm`
				: `layer ${s.layerIndex + 1} (${label}) at the plan's ${plain(own)} cm (not swept)`,
		]);
	}
	const bw = doc.probe.bandwidthFraction > 0 ? `${plain(doc.probe.bandwidthFraction * 100)} % bandwidth` : 'narrowband';
	const planFreqShown = s.freqMhz.length === 1 && s.freqMhz[0] === doc.probe.centerMhz;
	const planFreq = s.freqSwept && !planFreqShown ? ` (the plan has ${plain(doc.probe.centerMhz)} MHz)` : '';
	out.push(['Probe', `${list(s.freqMhz, 'MHz')} centre frequency${planFreq}, ${bw}`]);
	if (s.angleSwept || s.angleDeg.some((a) => a !== 0)) {
		const own = doc.probe.angleDeg ?? 0;
		out.push([
			'Beam angle',
			`${list(s.angleDeg, '°')} from the layer normal${s.angleSwept ? `; the plan has ${plain(own)}°` : ''}`,
		]);
	}
	out.push(['Receive', s.receive.map((r) => (r === 'fundamental' ? 'fundamental' : `${r} (2·f0)`)).join(', ')]);
	for (const w of s.swaps) {
		out.push([
			`Layer ${w.layer} tissue`,
			w.choices.map((c) => c.record.label + (c.from ? ` (${c.from})` : '')).join(', '),
		]);
	}
	out.push([
		'Display',
		`${plain(doc.display.depthCm)} cm at an assumed ${plain(doc.display.assumedSpeedMps)} m/s; samples every ${plain(s.stepCm)} cm`,
	]);
	const bank = doc.sliders;
	const sliderBase =
		bank.rampDbPerCmMhz > 0
			? `as offsets from the scanner's own ramp of ${plain(bank.rampDbPerCmMhz)} dB/cm/MHz (0 = centre detent)`
			: 'absolute (no built-in ramp)';
	out.push([
		'Controls',
		`${bank.count} sliders from ${plain(bank.minDb)} to ${plain(bank.maxDb)} dB, ` +
			`knots at ${bank.knots} (${bank.ends} ends), ` +
			`knots at ${list(
				t.knotDepthsCm.map((d) => roundTo(d, 2)),
				'cm',
			)}, ${sliderBase}; ` +
			`master gain ${plain(doc.masterGain.minDb)} to ${plain(doc.masterGain.maxDb)} dB`,
	]);
	const budget = sharedNoiseBudget(t);
	const budgets = [...new Set(t.rows.map((r) => fixed(r.noiseBudgetDb, 1)))];
	out.push([
		'Noise budget',
		budget !== null
			? `${fixed(budget, 1)} dB${doc.phantomCalibration ? ' (from the phantom calibration)' : ''}`
			: `per row, ${budgets.join(' or ')} dB (from the phantom calibration at each row's probe settings)`,
	]);
	const ladderFrom =
		s.ladderFrom === 'freq'
			? 'the probe frequencies above'
			: s.ladderFrom === 'default'
				? 'the default ladder'
				: 'the --ladder list';
	const targetText = s.targetFollowsLayer
		? `, ${s.targetRule} (${plain(roundTo(s.targetDepthCm, 2))} cm in the plan as it is; it follows the layers above it),`
		: ` ${plain(s.targetDepthCm)} cm`;
	out.push([
		'Highest reaching frequency',
		`the highest of ${list(s.ladderMhz, 'MHz')} (${ladderFrom}) whose echo from the target depth${targetText} ` +
			`stays within the noise budget less a ${plain(s.marginDb)} dB margin`,
	]);
	if (s.delta) {
		const ref = t.reference;
		const own =
			s.layerIndex !== null ? `layer ${s.layerIndex + 1} at ${plain(doc.layers[s.layerIndex]!.thicknessCm)} cm, ` : '';
		out.push([
			'Deltas',
			`row minus the standard habitus (the plan as it is: ${own}${plain(doc.probe.centerMhz)} MHz, ` +
				`${doc.probe.receive ?? 'fundamental'}): master ${fixed(ref.masterGainDb, 1)} dB, ` +
				`sliders ${ref.slidersDb.map((x) => signed(x, 1)).join(' ')} dB`,
		]);
	}
	if (o.generatedAt) out.push(['Generated', o.generatedAt]);
	return out;
}

/** True when the table shows a beam-angle column: the angle is swept or the plan's is not 0. */
export function showsAngle(t: ProtocolTable): boolean {
	return t.sweep.angleSwept || t.sweep.angleDeg.some((a) => a !== 0);
}

/** Rows grouped by habitus: the same swept thickness, beam angle, receive mode and swaps (frequency aside). */
export function habitusGroups(t: ProtocolTable): TableRow[][] {
	const groups = new Map<string, TableRow[]>();
	for (const r of t.rows) {
		const key = JSON.stringify([r.layerCm, r.angleDeg, r.receive, r.swapLabels]);
		const g = groups.get(key);
		if (g) g.push(r);
		else groups.set(key, [r]);
	}
	return [...groups.values()];
}

/** True when each habitus has one row, so the highest reaching frequency can sit in the main table. */
export function highestPerRow(t: ProtocolTable): boolean {
	return t.sweep.freqMhz.length === 1;
}
