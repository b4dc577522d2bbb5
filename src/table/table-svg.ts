/**
 * The protocol table as an SVG chart a document can embed: small multiples, one group per probe
 * frequency / receive mode / tissue swap and one small chart per habitus (thickness of the swept
 * layer) in each group, all on one scale, so six fat values never sit on top of each other. Depth
 * runs down the page as on the image, compensation (dB) to the right; the part below the noise floor
 * is dashed grey; slider knots carry their values; each chart names the highest reaching frequency.
 * With `--delta` the curves are differences from the standard habitus. Under the panels: legend,
 * inputs, tissues with sources, model, notes and the caution line. Hand-written SVG 1.1, all text
 * escaped, coordinates with fixed decimals.
 */
import {computeCurve, modelVersion} from '../engine/compensation-curve.js';
import {cautionLine} from '../report/cautions.js';
import {SweepError, type ResolvedSweep} from './sweep-spec.js';
import type {ProtocolTable, TableRow} from './sweep-runner.js';
import {roundTo} from '../plan/rounding.js';
import {
	fixed,
	inputLines,
	plain,
	showsAngle,
	signed,
	sweptLayerLabel,
	type TableFormatOptions,
} from './table-common.js';
import {resolvePlan} from '../plan/resolve-plan.js';

/** Most groups (frequency × receive × swap) in one chart. */
export const maxSvgPanels = 24;
/** Most habitus values (small charts) per group. */
export const maxSvgLines = 16;

const pad = 24;
/** Narrowest chart, px, so the text under one panel stays readable. */
const minWidth = 760;
const footFont = 11;
const lineGap = 15;

/** Escapes text for XML content and attribute values. */
export function xmlText(s: string): string {
	return (
		s
			.replace(/&/g, '&amp;')
			.replace(/</g, '&lt;')
			.replace(/>/g, '&gt;')
			.replace(/"/g, '&quot;')
			.replace(/'/g, '&apos;')
			// Characters XML 1.0 does not allow.
			.replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '')
	);
}

/** Throws a {@link SweepError} when the chart would be unreadable; call before running the sweep. */
export function checkSvgSweep(sweep: ResolvedSweep): void {
	const lines = Math.max(1, sweep.fatCm.length);
	if (lines > maxSvgLines) {
		throw new SweepError(
			'format',
			`--format svg: draws one line per --fat value, at most ${maxSvgLines} (got ${lines}); shorten --fat or use markdown, csv or json`,
		);
	}
	const panels = sweep.rowCount / lines;
	if (panels > maxSvgPanels) {
		throw new SweepError(
			'format',
			'--format svg: draws one panel per frequency, beam angle, receive mode and swapped ' +
				`tissue, at most ${maxSvgPanels} (got ${panels}); shorten --freq, --angle, --receive or ` +
				'--swap, or use markdown, csv or json',
		);
	}
}

/** A round step for about `target` ticks over `span`. */
function niceStep(span: number, target: number): number {
	const raw = span / target;
	const p = 10 ** Math.floor(Math.log10(raw));
	for (const m of [1, 2, 2.5, 5, 10]) if (m * p >= raw) return m * p;
	return 10 * p;
}

function ticks(lo: number, hi: number, step: number): number[] {
	const out: number[] = [];
	for (let v = Math.ceil(lo / step - 1e-9) * step; v <= hi + 1e-9; v += step) out.push(Number(v.toFixed(6)));
	return out;
}

/** Greedy word wrap to about `width` characters. */
function wrap(text: string, width: number): string[] {
	const out: string[] = [];
	let line = '';
	for (const word of text.split(/\s+/)) {
		if (line && line.length + 1 + word.length > width) {
			out.push(line);
			line = word;
		} else line = line ? `${line} ${word}` : word;
	}
	if (line) out.push(line);
	return out;
}

interface Curve {
	readonly depthsCm: readonly number[];
	readonly compensationDb: readonly number[];
}

function curveOf(t: ProtocolTable, r: TableRow): Curve {
	if (r.curve) return r.curve;
	const c = computeCurve(r.plan, {stepCm: t.sweep.stepCm, band: false});
	return {depthsCm: c.samples.map((s) => s.displayedDepthCm), compensationDb: c.samples.map((s) => s.compensationDb)};
}

function valueAt(c: Curve, depth: number): number {
	const ds = c.depthsCm;
	for (let i = 1; i < ds.length; i++) {
		if (ds[i]! >= depth) {
			const a = ds[i - 1]!;
			const b = ds[i]!;
			const w = b > a ? (depth - a) / (b - a) : 0;
			return c.compensationDb[i - 1]! * (1 - w) + c.compensationDb[i]! * w;
		}
	}
	return c.compensationDb[c.compensationDb.length - 1]!;
}

function panelTitle(r: TableRow, t: ProtocolTable): string {
	const parts = [`${plain(r.centerMhz)} MHz${showsAngle(t) ? ` at ${plain(r.angleDeg)}°` : ''} ${r.receive}`];
	t.sweep.swaps.forEach((s, k) => parts.push(`layer ${s.layer}: ${r.swapLabels[k]}`));
	return parts.join(', ');
}

/** Where the highest reaching frequency meets the noise floor, when it does within the search. */
function floorText(penetrationCm: number | null): string {
	return penetrationCm !== null ? ` (floor ${fixed(penetrationCm, 1)} cm)` : '';
}

/** Small multiples: at most this many habitus side by side before a group wraps. */
const cellsPerLine = 5;
const cellW = 236;
const cellH = 330;
const cell = {left: 40, right: 50, top: 46, bottom: 40};
const muted = '#9A9A9A';

/** The polyline points of a curve between two depths (inclusive), or '' when fewer than two. */
function segment(c: Curve, from: number, to: number, xOf: (db: number) => number, yOf: (cm: number) => number): string {
	const pts: string[] = [];
	for (let i = 0; i < c.depthsCm.length; i++) {
		const d = c.depthsCm[i]!;
		if (d >= from - 1e-9 && d <= to + 1e-9) pts.push(`${fixed(xOf(c.compensationDb[i]!), 1)},${fixed(yOf(d), 1)}`);
	}
	return pts.length >= 2 ? pts.join(' ') : '';
}

/** The curve shown for a row: its compensation, or with `--delta` its difference from the standard habitus. */
function shownCurve(c: Curve, reference: Curve | null): Curve {
	if (!reference) return c;
	return {depthsCm: c.depthsCm, compensationDb: c.depthsCm.map((d, i) => c.compensationDb[i]! - valueAt(reference, d))};
}

export function tableSvg(t: ProtocolTable, o: TableFormatOptions = {}): string {
	const s = t.sweep;
	const lineCount = Math.max(1, s.fatCm.length);
	const groups: TableRow[][] = [];
	for (let i = 0; i < t.rows.length; i += lineCount) groups.push(t.rows.slice(i, i + lineCount));
	const reference = s.delta ? curveOf(t, {plan: resolvePlan(s.doc)} as TableRow) : null;
	const curves = new Map<TableRow, Curve>(t.rows.map((r) => [r, shownCurve(curveOf(t, r), reference)]));

	const depthCm = s.doc.display.depthCm;
	let lo = 0;
	let hi = 0;
	for (const c of curves.values()) {
		for (const v of c.compensationDb) {
			if (v < lo) lo = v;
			if (v > hi) hi = v;
		}
	}
	const dbStep = niceStep(Math.max(s.delta ? 4 : 10, hi - lo), 4);
	const dbLo = Math.floor(lo / dbStep) * dbStep;
	const dbHi = Math.max(dbLo + dbStep, Math.ceil(hi / dbStep) * dbStep);
	const depthStep = niceStep(depthCm, 8);

	const cols = Math.min(cellsPerLine, lineCount);
	const width = Math.max(minWidth, pad * 2 + cols * cellW);
	const textChars = Math.floor((width - 2 * pad) / (footFont * 0.56));
	const layerLabel = sweptLayerLabel(t);
	const swept = layerLabel !== null && s.layerIndex !== null && s.fatSwept;
	const cellLabel = (r: TableRow) =>
		r.layerCm === null || layerLabel === null ? 'plan as given' : `${layerLabel} ${plain(r.layerCm)} cm`;
	const wide = (px: number) => Math.floor((textChars * footFont) / px);

	const out: string[] = [];
	const title = `Depth-gain curves: ${s.doc.name}`;
	let y = pad + 18;
	const head: string[] = [];
	head.push(`<text x="${pad}" y="${y}" font-size="18" font-weight="bold">${xmlText(title)}</text>`);
	y += 20;
	const what = s.delta
		? 'each curve is the habitus minus the standard habitus (the plan as it is), in dB; slider and master values are deltas too'
		: 'compensation (dB, round trip) to the right';
	const perThickness = swept
		? `One small chart per thickness of layer ${s.layerIndex! + 1} (${layerLabel}), on a shared scale. `
		: '';
	const sub = `${perThickness}Depth (displayed cm) runs down, ${what}.`;
	for (const l of wrap(sub, wide(12))) {
		head.push(`<text x="${pad}" y="${y}" font-size="12">${xmlText(l)}</text>`);
		y += 16;
	}
	for (const l of wrap(`Caution: ${cautionLine}`, wide(12))) {
		head.push(`<text x="${pad}" y="${y}" font-size="12" font-weight="bold" fill="#B00020">${xmlText(l)}</text>`);
		y += 16;
	}

	// Key: how the parts of each chart are drawn (the same in every chart).
	const legend: string[] = [];
	y += 8;
	const keyItems: [string, string][] = [
		[`<line x1="0" y1="-4" x2="26" y2="-4" stroke="#0072B2" stroke-width="2.5"/>`, 'above the noise floor'],
		[
			`<line x1="0" y1="-4" x2="26" y2="-4" stroke="${muted}" stroke-width="2" stroke-dasharray="4 3"/>`,
			'below the noise floor or a barrier: gain lifts only noise',
		],
		[
			`<circle cx="13" cy="-4" r="3.5" fill="#FFFFFF" stroke="#0072B2" stroke-width="1.5"/>`,
			`slider knot; its ${s.delta ? 'Δ ' : ''}value in dB at the right`,
		],
		[`<line x1="0" y1="-4" x2="26" y2="-4" stroke="#B00020" stroke-width="1" stroke-dasharray="2 2"/>`, 'target depth'],
	];
	let kx = pad;
	for (const [mark, text] of keyItems) {
		const w = 40 + Math.ceil(text.length * 12 * 0.55);
		if (kx + w > width - pad) {
			kx = pad;
			y += lineGap;
		}
		legend.push(
			`<g transform="translate(${kx},${y})">${mark}<text x="32" y="0" font-size="12">${xmlText(text)}</text></g>`,
		);
		kx += w + 10;
	}
	y += lineGap + 6;

	const body: string[] = [];
	const plotW = cellW - cell.left - cell.right;
	const plotH = cellH - cell.top - cell.bottom;
	const xOf = (db: number) => ((db - dbLo) / (dbHi - dbLo)) * plotW;
	const yOf = (cm: number) => (Math.min(cm, depthCm) / depthCm) * plotH;
	for (const rows of groups) {
		body.push(
			`<text x="${pad}" y="${y + 14}" font-size="14" font-weight="bold">${xmlText(panelTitle(rows[0]!, t))}</text>`,
		);
		y += 22;
		rows.forEach((r, k) => {
			const px = pad + (k % cols) * cellW + cell.left;
			const py = y + Math.floor(k / cols) * cellH + cell.top;
			const c = curves.get(r)!;
			const g: string[] = [`<g transform="translate(${px},${py})">`];
			g.push(`<text x="-${cell.left - 4}" y="-30" font-size="12" font-weight="bold">${xmlText(cellLabel(r))}</text>`);
			const reach =
				r.highestReachingMhz === null
					? `no listed MHz reaches ${plain(roundTo(r.targetDepthCm, 1))} cm`
					: `highest reaching ${plain(r.highestReachingMhz)} MHz${floorText(r.highestReachingPenetrationCm)}`;
			g.push(`<text x="-${cell.left - 4}" y="-16" font-size="10">${xmlText(reach)}</text>`);
			const master =
				s.delta && r.delta
					? `Δ master ${signed(r.delta.masterDeltaDb, 1)} dB`
					: `master ${fixed(r.masterGainDb, 1)} dB`;
			g.push(
				`<text x="-${cell.left - 4}" y="-4" font-size="10">${xmlText(`${master}, fit ±${fixed(r.residualDb, 1)} dB`)}</text>`,
			);
			g.push(`<rect x="0" y="0" width="${plotW}" height="${plotH}" fill="none" stroke="#444444"/>`);
			for (const v of ticks(dbLo, dbHi, dbStep)) {
				const x = fixed(xOf(v), 1);
				g.push(`<line x1="${x}" y1="0" x2="${x}" y2="${plotH}" stroke="${v === 0 ? '#888888' : '#E4E4E4'}"/>`);
				g.push(`<text x="${x}" y="${plotH + 13}" font-size="9" text-anchor="middle">${plain(v)}</text>`);
			}
			for (const v of ticks(0, depthCm, depthStep)) {
				const yy = fixed(yOf(v), 1);
				g.push(`<line x1="0" y1="${yy}" x2="${plotW}" y2="${yy}" stroke="#E4E4E4"/>`);
				g.push(`<text x="-5" y="${yy}" font-size="9" text-anchor="end" dominant-baseline="middle">${plain(v)}</text>`);
			}
			g.push(
				`<text x="${fixed(plotW / 2, 1)}" y="${plotH + 28}" font-size="10" text-anchor="middle">${s.delta ? 'Δ dB' : 'dB'}</text>`,
			);
			if (r.targetDepthCm <= depthCm) {
				const ty = fixed(yOf(r.targetDepthCm), 1);
				g.push(
					`<line x1="0" y1="${ty}" x2="${plotW}" y2="${ty}" stroke="#B00020" stroke-width="1" stroke-dasharray="2 2"/>`,
				);
			}
			const good = Math.min(r.penetrationDepthCm ?? depthCm, r.blockedDepthCm ?? depthCm, depthCm);
			const above = segment(c, 0, good, xOf, yOf);
			const below = segment(c, good, depthCm, xOf, yOf);
			const name = `${cellLabel(r)}, ${panelTitle(r, t)}, row ${r.index}`;
			if (above)
				g.push(
					`<polyline fill="none" stroke="#0072B2" stroke-width="2.2" points="${above}"><title>${xmlText(name)}</title></polyline>`,
				);
			if (below) {
				const dashed = `fill="none" stroke="${muted}" stroke-width="2" stroke-dasharray="4 3"`;
				const title = xmlText(`${name}: below the noise floor`);
				g.push(`<polyline ${dashed} points="${below}"><title>${title}</title></polyline>`);
			}
			const values = r.delta ? r.delta.sliderDeltasDb : r.slidersDb;
			t.knotDepthsCm.forEach((d, j) => {
				if (d > depthCm) return;
				const ky = fixed(yOf(d), 1);
				g.push(
					`<circle cx="${fixed(xOf(valueAt(c, d)), 1)}" cy="${ky}" r="3" fill="#FFFFFF" stroke="#0072B2" stroke-width="1.5"/>`,
				);
				g.push(
					`<text x="${plotW + 4}" y="${ky}" font-size="9" dominant-baseline="middle">${xmlText(`S${j + 1} ${signed(values[j]!, 1)}`)}</text>`,
				);
			});
			g.push('</g>');
			body.push(g.join('\n'));
		});
		y += Math.ceil(rows.length / cols) * cellH + 6;
	}
	y += 8;

	// Footer: inputs, tissues, model, notes, caution.
	const foot: string[] = [];
	const para = (text: string, bold = false) => {
		for (const l of wrap(text, textChars)) {
			foot.push(
				`<text x="${pad}" y="${y}" font-size="${footFont}"${bold ? ' font-weight="bold"' : ''}>${xmlText(l)}</text>`,
			);
			y += lineGap;
		}
	};
	for (const [k, v] of inputLines(t, o)) para(`${k}: ${v}`);
	para(`Model: ${modelVersion}`);
	y += 4;
	para('Tissues used (one-way attenuation α0 in dB/cm/MHz^n):', true);
	for (const u of t.tissues) {
		const tt = u.tissue;
		para(
			`${u.where}: ${tt.label}: c ${plain(tt.speedMps)} m/s, ρ ${plain(tt.densityKgM3)} kg/m³, ` +
				`α0 ${plain(tt.alphaDbPerCmMhz)}, n ${plain(tt.exponent)}. Source: ` +
				`${tt.source ?? 'no source recorded'}${u.from ? `; taken from ${u.from}` : ''}`,
		);
	}
	y += 4;
	for (const n of t.notes) para(n);
	para(`Caution: ${cautionLine}`, true);
	const height = y + pad - lineGap + 4;

	out.push('<?xml version="1.0" encoding="UTF-8"?>');
	out.push(
		`<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="${width}" height="${height}" ` +
			`viewBox="0 0 ${width} ${height}" font-family="Helvetica, Arial, sans-serif">`,
	);
	out.push(`<title>${xmlText(title)}</title>`);
	out.push(`<desc>${xmlText(`${t.rows.length} curves; ${modelVersion}. ${cautionLine}`)}</desc>`);
	out.push(`<rect x="0" y="0" width="${width}" height="${height}" fill="#FFFFFF"/>`);
	out.push(...head, ...legend, ...body, ...foot);
	out.push('</svg>');
	return out.join('\n') + '\n';
}
