/**
 * The curve as text, pure: depth runs down the rows (skin at the top, as the layers are stacked),
 * gain runs across. Plain characters carry every meaning so nothing depends on colour:
 *   *  gain the echo needs at that depth      -  its spread (tissue values at the ends of their range)
 *   o  what the fitted controls give at a slider's depth, @ the selected one
 *   ~  background of depths below the noise floor      #  background of depths below a barrier
 */
import {deliveredCompensationDb} from '../../engine/compensation-curve.js';
import {clip} from './text-fit.js';
import type {CurveResult} from '../../engine/types.js';

export interface PlotOptions {
	/** Total width of every line, characters. */
	readonly width: number;
	/** Most depth rows to use (not counting the axis and legend lines); fewer when that gives round depths. */
	readonly height: number;
	/** Slider drawn as `@` instead of `o`. */
	readonly selectedSlider?: number;
}

export interface Plot {
	/** The dB axis line. */
	readonly axis: string;
	readonly rows: readonly string[];
	readonly legend: string;
	/** dB at the left and right edge of the grid. */
	readonly lowDb: number;
	readonly highDb: number;
}

export const glyph = {curve: '*', band: '-', slider: 'o', selected: '@', noise: '~', blocked: '#', empty: ' '} as const;

/** Compensation the fitted master, ramp and sliders give at each slider's depth (same scale as the curve). */
export function sliderDeliveredDb(r: CurveResult): number[] {
	return r.fit.sliders.map((s) => deliveredCompensationDb(r.plan, r.fit, s.depthCm));
}

const labelWidth = 5;

function fit(text: string, width: number): string {
	return text.length > width ? text.slice(0, width) : text.padEnd(width);
}

/** The legend names what the plot can show: `@` when a slider is chosen, `~` and `#` when they occur. */
function legendFor(width: number, marks: {selected: boolean; noise: boolean; blocked: boolean}): string {
	const entries = (words: Record<string, string>, gap: string) =>
		[
			`${glyph.curve}${gap}${words['need']}`,
			`${glyph.band}${gap}${words['band']}`,
			`${glyph.slider}${gap}slider`,
			marks.selected ? `${glyph.selected}${gap}${words['selected']}` : '',
			marks.noise ? `${glyph.noise}${gap}noise` : '',
			marks.blocked ? `${glyph.blocked}${gap}${words['blocked']}` : '',
		]
			.filter(Boolean)
			.join(' ');
	const candidates = [
		entries({need: 'need', band: 'spread', selected: 'chosen', blocked: 'blocked'}, ' '),
		entries({need: 'need', band: 'band', selected: 'this', blocked: 'block'}, ' '),
		entries({need: 'need', band: 'spread', selected: 'chosen', blocked: 'blocked'}, ''),
		entries({need: 'need', band: 'band', selected: 'this', blocked: 'block'}, ''),
	];
	return fit(candidates.find((l) => l.length <= width) ?? candidates[3]!, width);
}

/** Depth steps a row may span, cm, finest first: steps a depth scale reads easily (0, 0.8, 1.6 …). */
const rowSteps = [0.1, 0.2, 0.25, 0.3, 0.4, 0.5, 0.6, 0.8, 1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 10];

/** Share of the offered rows a round step must fill; below it the rows stretch to fill them all. */
const roundFill = 0.85;

/** The finest round step that fits in `maxRows` rows (the last row may be partly past the bottom). */
function roundRowStep(depthCm: number, maxRows: number): number | undefined {
	return rowSteps.find((step) => Math.ceil(depthCm / step - 1e-9) <= maxRows);
}

/**
 * Depth per row for a display depth: a round step when it fills most of `maxRows`, else the depth
 * spread evenly over all of them (a tall terminal is then used whole, and the rows are labelled
 * only where a round depth falls, like the tick marks of a depth scale).
 */
export function plotRowStep(depthCm: number, maxRows: number): number {
	const round = roundRowStep(depthCm, maxRows);
	if (round !== undefined && Math.ceil(depthCm / round - 1e-9) >= roundFill * maxRows) return round;
	return depthCm / Math.max(2, maxRows);
}

export function plotRowCount(depthCm: number, maxRows: number): number {
	return Math.max(2, Math.ceil(depthCm / plotRowStep(depthCm, maxRows) - 1e-9));
}

/** Round depths labelled on a stretched plot, cm: the finest that leaves at least 1.5 rows per label. */
const tickSteps = [0.1, 0.2, 0.5, 1, 2, 5, 10];

/** Row labels: every row's top depth for a round step; on a stretched plot only rows that hold a tick. */
function rowLabels(rowCount: number, rowCm: number): string[] {
	const isRound = rowSteps.some((s) => Math.abs(s - rowCm) < 1e-9);
	if (isRound) return Array.from({length: rowCount}, (_, row) => (row * rowCm).toFixed(1));
	const tick = tickSteps.find((t) => t >= 1.5 * rowCm) ?? 10;
	return Array.from({length: rowCount}, (_, row) => {
		const top = row * rowCm;
		const mark = Math.ceil(top / tick - 1e-9) * tick;
		return mark < top + rowCm - 1e-9 ? mark.toFixed(1) : '';
	});
}

export function depthPlot(r: CurveResult, o: PlotOptions): Plot {
	const depth = r.plan.display.depthCm;
	const rowCm = plotRowStep(depth, Math.max(2, o.height));
	const height = plotRowCount(depth, Math.max(2, o.height));
	const note = o.width >= 40 ? Math.min(11, o.width - 30) : 0;
	const grid = Math.max(8, o.width - labelWidth - 3 - (note ? note + 1 : 0));
	const totals = sliderDeliveredDb(r);

	// The scale holds 0 dB, the whole band and every slider's total (drawn on every key press: loops,
	// not spread arrays of every sample).
	let least = 0;
	let most = 0;
	for (const s of r.samples) {
		least = Math.min(least, s.lowDb, s.highDb);
		most = Math.max(most, s.lowDb, s.highDb);
	}
	for (const t of totals) {
		least = Math.min(least, t);
		most = Math.max(most, t);
	}
	const lowDb = Math.floor(least / 10) * 10;
	const highDb = Math.max(lowDb + 10, Math.ceil(most / 10) * 10);
	const col = (db: number) =>
		Math.max(0, Math.min(grid - 1, Math.round(((db - lowDb) / (highDb - lowDb)) * (grid - 1))));
	const rowOf = (d: number) => Math.max(0, Math.min(height - 1, Math.floor(d / rowCm + 1e-9)));

	const cells: string[][] = Array.from({length: height}, () => new Array<string>(grid).fill(glyph.empty));
	const notes: string[] = new Array<string>(height).fill('');
	// Samples run down in depth: each row scans only from the first sample at or below its top
	// (drawn on every key press, so no per-row filtering of every sample).
	const samples = r.samples;
	let first = 0;
	for (let row = 0; row < height; row++) {
		const top = row * rowCm;
		const bottom = Math.min(depth, (row + 1) * rowCm);
		const isLast = row === height - 1;
		while (first < samples.length && samples[first]!.displayedDepthCm < top - 1e-9) first++;
		// The row's samples are samples[first … end − 1] (no list of them made).
		let end = first;
		for (let i = first; i < samples.length; i++) {
			const d = samples[i]!.displayedDepthCm;
			if (d < bottom - 1e-9 || (isLast && d <= bottom + 1e-9)) end = i + 1;
			else if (d > bottom + 1e-9) break;
		}
		if (end === first) continue;
		const line = cells[row]!;
		let isBlocked = true;
		let isNoise = true;
		let lo = Number.POSITIVE_INFINITY;
		let hi = Number.NEGATIVE_INFINITY;
		for (let i = first; i < end; i++) {
			const s = samples[i]!;
			isBlocked &&= s.blocked;
			isNoise &&= s.belowNoise;
			lo = Math.min(lo, s.lowDb);
			hi = Math.max(hi, s.highDb);
		}
		if (isBlocked || isNoise) line.fill(isBlocked ? glyph.blocked : glyph.noise);
		for (let c = col(lo); c <= col(hi); c++) line[c] = glyph.band;
		const mid = samples[first + Math.floor((end - first) / 2)]!;
		line[col(mid.compensationDb)] = glyph.curve;
	}
	// Notes: the barrier and the noise floor in their own rows, then each layer's name at its top
	// (or the next free row, so thin layers near the skin still get named).
	if (r.blockedDepthCm !== null) notes[rowOf(r.blockedDepthCm)] = `${glyph.blocked} blocked`;
	if (r.penetrationDepthCm !== null && !notes[rowOf(r.penetrationDepthCm)])
		notes[rowOf(r.penetrationDepthCm)] = `${glyph.noise} noise`;
	let next = 0;
	// Each layer's first sample, in one pass (layers run down in depth like the samples).
	const layerTops = new Array<number | undefined>(r.plan.layers.length);
	for (const s of samples) if (layerTops[s.layerIndex] === undefined) layerTops[s.layerIndex] = s.displayedDepthCm;
	r.plan.layers.forEach((layer, i) => {
		const firstCm = layerTops[i];
		if (firstCm === undefined) return;
		let row = Math.max(next, rowOf(firstCm));
		while (row < height && notes[row]) row++;
		if (row >= height) return;
		notes[row] = clip(layer.tissue.label, note);
		next = row + 1;
	});
	r.fit.sliders.forEach((s, k) => {
		cells[rowOf(s.depthCm)]![col(totals[k]!)] = k === o.selectedSlider ? glyph.selected : glyph.slider;
	});

	const labels = rowLabels(height, rowCm);
	const rows = cells.map((line, row) => {
		const label = labels[row]!.padStart(labelWidth);
		const tail = note ? ` ${fit(notes[row]!, note)}` : '';
		return `${label}|${line.join('')}|${tail}`;
	});

	const axisCells = new Array<string>(grid).fill(' ');
	const put = (db: number) => {
		const text = String(db);
		const at = Math.max(0, Math.min(grid - text.length, col(db) - (db === highDb ? text.length - 1 : 0)));
		for (let i = 0; i < text.length; i++) axisCells[at + i] = text[i]!;
	};
	put(lowDb);
	put(highDb);
	const midDb = Math.round((lowDb + highDb) / 20) * 10;
	if (midDb > lowDb && midDb < highDb && grid >= 20) put(midDb);
	const axis = fit(`${'cm'.padStart(labelWidth)} ${axisCells.join('')}  dB`, o.width);
	// No trailing blanks: Ink tokenises every character it is given, spaces included.
	return {
		axis: axis.trimEnd(),
		rows: rows.map((l) => fit(l, o.width).trimEnd()),
		legend: legendFor(o.width, {
			selected: o.selectedSlider !== undefined,
			noise: r.penetrationDepthCm !== null,
			blocked: r.blockedDepthCm !== null,
		}).trimEnd(),
		lowDb,
		highDb,
	};
}
