/**
 * The protocol table as an SVG chart a document can embed: one panel per probe frequency / receive
 * mode / tissue swap, one line per habitus (thickness of the swept layer) in each panel. Depth runs
 * down the page as on the image, compensation (dB) to the right. A dot marks where the echo meets
 * the noise floor. Under the panels: legend, inputs, tissues with sources, model, notes and the
 * caution line. Hand-written SVG 1.1, all text escaped, coordinates with fixed decimals.
 */
import {computeCurve, modelVersion} from '../engine/compensation-curve.js';
import {cautionLine} from '../report/cautions.js';
import {SweepError, type ProtocolTable, type ResolvedSweep, type TableRow} from './sweep.js';
import {fixed, inputLines, plain, sweptLayerLabel, type TableFormatOptions} from './table-common.js';

/** Most panels in one chart. */
export const maxSvgPanels = 24;
/** Most lines (habitus values) per panel: 8 colours, solid then dashed. */
export const maxSvgLines = 16;

const palette = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000', '#8C8C8C'];

const panelW = 380;
const panelH = 300;
const plot = {left: 58, right: 18, top: 34, bottom: 44};
const pad = 24;
const columnsMax = 3;
/** Narrowest chart, px, so the text under one panel stays readable. */
const minWidth = 760;
const footFont = 11;
const lineGap = 15;

/** Escapes text for XML content and attribute values. */
export function xmlText(s: string): string {
	return s
		.replace(/&/g, '&amp;')
		.replace(/</g, '&lt;')
		.replace(/>/g, '&gt;')
		.replace(/"/g, '&quot;')
		.replace(/'/g, '&apos;')
		// Characters XML 1.0 does not allow.
		.replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '');
}

/** Throws a {@link SweepError} when the chart would be unreadable; call before running the sweep. */
export function checkSvgSweep(sweep: ResolvedSweep): void {
	const lines = Math.max(1, sweep.fatCm.length);
	if (lines > maxSvgLines) {
		throw new SweepError('format', `--format svg: draws one line per --fat value, at most ${maxSvgLines} (got ${lines}); shorten --fat or use markdown, csv or json`);
	}
	const panels = sweep.rowCount / lines;
	if (panels > maxSvgPanels) {
		throw new SweepError('format', `--format svg: draws one panel per frequency, receive mode and swapped tissue, at most ${maxSvgPanels} (got ${panels}); shorten --freq, --receive or --swap, or use markdown, csv or json`);
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
	const c = computeCurve(r.plan, {stepCm: t.sweep.stepCm});
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
	const parts = [`${plain(r.centerMhz)} MHz ${r.receive}`];
	t.sweep.swaps.forEach((s, k) => parts.push(`layer ${s.layer}: ${r.swapLabels[k]}`));
	return parts.join(', ');
}

export function tableSvg(t: ProtocolTable, o: TableFormatOptions = {}): string {
	const s = t.sweep;
	const lineCount = Math.max(1, s.fatCm.length);
	const panels: TableRow[][] = [];
	for (let i = 0; i < t.rows.length; i += lineCount) panels.push(t.rows.slice(i, i + lineCount));
	const curves = new Map<TableRow, Curve>(t.rows.map((r) => [r, curveOf(t, r)]));

	const depthCm = s.doc.display.depthCm;
	let lo = 0;
	let hi = 0;
	for (const c of curves.values()) {
		for (const v of c.compensationDb) {
			if (v < lo) lo = v;
			if (v > hi) hi = v;
		}
	}
	const dbStep = niceStep(Math.max(10, hi - lo), 6);
	const dbLo = Math.floor(lo / dbStep) * dbStep;
	const dbHi = Math.max(dbLo + dbStep, Math.ceil(hi / dbStep) * dbStep);
	const depthStep = niceStep(depthCm, 8);

	const cols = Math.min(columnsMax, panels.length);
	const width = Math.max(minWidth, pad * 2 + cols * panelW);
	const textChars = Math.floor((width - 2 * pad) / (footFont * 0.56));
	const layerLabel = sweptLayerLabel(t);

	const lineLabel = (r: TableRow) => (r.layerCm === null || layerLabel === null ? 'plan as given' : `${layerLabel} ${plain(r.layerCm)} cm`);
	const stroke = (k: number) => palette[k % palette.length]!;
	const dash = (k: number) => (k >= palette.length ? ' stroke-dasharray="6 3"' : '');

	const out: string[] = [];
	const title = `Depth-gain curves: ${s.doc.name}`;
	let y = pad + 18;
	const head: string[] = [];
	head.push(`<text x="${pad}" y="${y}" font-size="18" font-weight="bold">${xmlText(title)}</text>`);
	y += 20;
	const sub =
		layerLabel !== null && s.fatSwept
			? `One line per thickness of layer ${s.layerIndex! + 1} (${layerLabel}). Depth (displayed cm) runs down, compensation (dB, round trip) to the right; a dot marks the noise floor.`
			: 'Depth (displayed cm) runs down, compensation (dB, round trip) to the right; a dot marks the noise floor.';
	for (const l of wrap(sub, Math.floor((textChars * footFont) / 12))) {
		head.push(`<text x="${pad}" y="${y}" font-size="12">${xmlText(l)}</text>`);
		y += 16;
	}
	for (const l of wrap(`Caution: ${cautionLine}`, Math.floor((textChars * footFont) / 12))) {
		head.push(`<text x="${pad}" y="${y}" font-size="12" font-weight="bold" fill="#B00020">${xmlText(l)}</text>`);
		y += 16;
	}
	y -= 6;

	// Legend: a caption naming the swept layer, then one short entry per habitus.
	const legend: string[] = [];
	y += 14;
	const swept = layerLabel !== null && s.layerIndex !== null && s.fatSwept;
	const shortLabel = (r: TableRow) => (swept && r.layerCm !== null ? `${plain(r.layerCm)} cm` : lineLabel(r));
	let lx0 = pad;
	if (swept) {
		const caption = `Layer ${s.layerIndex! + 1}, ${layerLabel}:`;
		legend.push(`<text x="${pad}" y="${y}" font-size="12" font-weight="bold">${xmlText(caption)}</text>`);
		lx0 = pad + Math.ceil(caption.length * 12 * 0.6) + 12;
	}
	const legendItemW = swept ? 88 : 190;
	const perRow = Math.max(1, Math.floor((width - pad - lx0) / legendItemW));
	panels[0]!.forEach((r, k) => {
		const lx = lx0 + (k % perRow) * legendItemW;
		const ly = y + Math.floor(k / perRow) * lineGap;
		legend.push(
			`<line x1="${lx}" y1="${ly - 4}" x2="${lx + 26}" y2="${ly - 4}" stroke="${stroke(k)}" stroke-width="2.5"${dash(k)}/>`,
			`<text x="${lx + 32}" y="${ly}" font-size="12">${xmlText(shortLabel(r))}</text>`,
		);
	});
	y += Math.ceil(panels[0]!.length / perRow) * lineGap;
	const panelTop = y;

	// Panels.
	const body: string[] = [];
	const plotW = panelW - plot.left - plot.right;
	const plotH = panelH - plot.top - plot.bottom;
	const xOf = (db: number) => ((db - dbLo) / (dbHi - dbLo)) * plotW;
	const yOf = (cm: number) => (cm / depthCm) * plotH;
	panels.forEach((rows, p) => {
		const px = pad + (p % cols) * panelW + plot.left;
		const py = panelTop + Math.floor(p / cols) * panelH + plot.top;
		const g: string[] = [];
		g.push(`<g transform="translate(${px},${py})">`);
		g.push(`<text x="0" y="-12" font-size="13" font-weight="bold">${xmlText(panelTitle(rows[0]!, t))}</text>`);
		g.push(`<rect x="0" y="0" width="${plotW}" height="${plotH}" fill="none" stroke="#444444"/>`);
		for (const v of ticks(dbLo, dbHi, dbStep)) {
			const x = fixed(xOf(v), 1);
			g.push(`<line x1="${x}" y1="0" x2="${x}" y2="${plotH}" stroke="#DDDDDD"/>`);
			g.push(`<text x="${x}" y="${plotH + 14}" font-size="10" text-anchor="middle">${plain(v)}</text>`);
		}
		for (const v of ticks(0, depthCm, depthStep)) {
			const yy = fixed(yOf(v), 1);
			g.push(`<line x1="0" y1="${yy}" x2="${plotW}" y2="${yy}" stroke="#DDDDDD"/>`);
			g.push(`<text x="-6" y="${yy}" font-size="10" text-anchor="end" dominant-baseline="middle">${plain(v)}</text>`);
		}
		g.push(`<text x="${fixed(plotW / 2, 1)}" y="${plotH + 32}" font-size="11" text-anchor="middle">compensation, dB</text>`);
		g.push(`<text transform="translate(-40,${fixed(plotH / 2, 1)}) rotate(-90)" font-size="11" text-anchor="middle">displayed depth, cm</text>`);
		rows.forEach((r, k) => {
			const c = curves.get(r)!;
			const pts = c.depthsCm.map((d, i) => `${fixed(xOf(c.compensationDb[i]!), 1)},${fixed(yOf(d), 1)}`).join(' ');
			g.push(`<polyline fill="none" stroke="${stroke(k)}" stroke-width="2"${dash(k)} points="${pts}"><title>${xmlText(`${lineLabel(r)}, row ${r.index}`)}</title></polyline>`);
			if (r.penetrationDepthCm !== null) {
				g.push(`<circle cx="${fixed(xOf(valueAt(c, r.penetrationDepthCm)), 1)}" cy="${fixed(yOf(r.penetrationDepthCm), 1)}" r="3.5" fill="${stroke(k)}"/>`);
			}
		});
		g.push('</g>');
		body.push(g.join('\n'));
	});
	y = panelTop + Math.ceil(panels.length / cols) * panelH + 8;

	// Footer: inputs, tissues, model, notes, caution.
	const foot: string[] = [];
	const para = (text: string, bold = false) => {
		for (const l of wrap(text, textChars)) {
			foot.push(`<text x="${pad}" y="${y}" font-size="${footFont}"${bold ? ' font-weight="bold"' : ''}>${xmlText(l)}</text>`);
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
			`${u.where}: ${tt.label}: c ${plain(tt.speedMps)} m/s, ρ ${plain(tt.densityKgM3)} kg/m³, α0 ${plain(tt.alphaDbPerCmMhz)}, n ${plain(tt.exponent)}. Source: ${tt.source ?? 'no source recorded'}${u.from ? `; taken from ${u.from}` : ''}`,
		);
	}
	y += 4;
	for (const n of t.notes) para(n);
	para(`Caution: ${cautionLine}`, true);
	const height = y + pad - lineGap + 4;

	out.push('<?xml version="1.0" encoding="UTF-8"?>');
	out.push(
		`<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="Helvetica, Arial, sans-serif">`,
	);
	out.push(`<title>${xmlText(title)}</title>`);
	out.push(`<desc>${xmlText(`${t.rows.length} curves; ${modelVersion}. ${cautionLine}`)}</desc>`);
	out.push(`<rect x="0" y="0" width="${width}" height="${height}" fill="#FFFFFF"/>`);
	out.push(...head, ...legend, ...body, ...foot);
	out.push('</svg>');
	return out.join('\n') + '\n';
}
