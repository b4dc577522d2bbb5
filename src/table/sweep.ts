/**
 * Protocol tables: one plan swept over habitus (the thickness of its subcutaneous layer), probe
 * centre frequency, receive mode and tissue swaps, each combination fitted like `evenecho curve`.
 *
 * Pure and synchronous: no file system, no process, no clock. The command line and the console
 * both call {@link resolveSweep} / {@link runSweep} (or {@link buildTable} for both in one step) and
 * hand the result to one of the formatters (table-markdown, table-csv, table-json, table-svg).
 */
import {harmonicSimplification, ladderSimplification, receiveModeNote} from '../engine/model-notes.js';
import type {ReceiveMode} from '../engine/types.js';
import {computeCurve} from '../engine/compensation-curve.js';
import {frequencyLadder} from '../engine/frequency-ladder.js';
import {settingsDelta, settingsOf, type GainSettings, type SettingsDelta} from '../engine/plan-difference.js';
import {libraryTissue, tissueIds} from '../engine/tissue-library.js';
import type {CurveWarning, EnginePlan, SliderFit, Tissue} from '../engine/types.js';
import {fatLayerIndex} from '../plan/fat-layer.js';
import {describeRange, limits, resolveTissue, type Limit, type LayerDocument, type PlanDocument} from '../plan/plan-schema.js';
import {resolveLayer, resolvePlan} from '../plan/resolve-plan.js';
import {describeTarget, targetDepthOf} from '../plan/plan-target.js';

/** Most rows one table may have (all sweeps multiplied). */
export const maxTableRows = 20_000;

/** Frequencies tried for the "highest reaching" column when no `--freq` list is given: 1 to 15 MHz
 * in 0.5 MHz steps (the same default as `evenecho ladder`). */
export const defaultLadderMhz: readonly number[] = Array.from({length: 29}, (_, i) => 1 + i / 2);

/** Margin range for the frequency ladder, dB (as `evenecho ladder`). */
export const marginLimit: Limit = {min: 0, max: 100};

/** Most entries in the `--ladder` list. */
export const maxLadderLength = 200;

export type {ReceiveMode};
export const receiveModes: readonly ReceiveMode[] = ['fundamental', 'tissue-harmonic', 'scatterer-harmonic'];

export {harmonicSimplification, ladderSimplification};

/** A tissue to put into a layer: a library id or a custom record, with where it came from. */
export interface TissueChoice {
	readonly tissue: LayerDocument['tissue'];
	/** Where it came from, e.g. `layer 4 of preset "lower-abdomen"`; absent for a library id typed in. */
	readonly from?: string;
}

/** One tissue axis: layer `layer` (1-based) takes each of `choices` in turn. */
export interface LayerSwap {
	readonly layer: number;
	readonly choices: readonly TissueChoice[];
}

/** What to sweep. Every field is optional: an empty spec gives one row, the plan as it is. */
export interface SweepSpec {
	/** Thicknesses of the swept (subcutaneous) layer, cm. */
	readonly fatCm?: readonly number[];
	/** The swept layer, 1-based; default the first layer whose tissue is `fat`. */
	readonly layer?: number;
	/** Probe centre frequencies, MHz; default the plan's own. */
	readonly freqMhz?: readonly number[];
	/** Beam angles from the layer normal, degrees; default the plan's own. */
	readonly angleDeg?: readonly number[];
	/** Receive modes; default the plan's own. */
	readonly receive?: readonly ReceiveMode[];
	/** Tissue swaps, each an axis of its own. */
	readonly swaps?: readonly LayerSwap[];
	/** Show sliders and master as differences from the standard habitus (the plan as it is). */
	readonly delta?: boolean;
	/** Margin below the noise budget the target depth must keep, dB; default 0. */
	readonly marginDb?: number;
	/** Frequencies for the "highest reaching" column; default the `freqMhz` list, else {@link defaultLadderMhz}. */
	readonly ladderMhz?: readonly number[];
	/** Sample spacing in displayed depth, cm; default 0.1 (as `evenecho curve`). */
	readonly stepCm?: number;
}

/** A bad sweep: `option` names the command-line option (without dashes); the message names it too. */
export class SweepError extends Error {
	constructor(
		readonly option: string,
		message: string,
	) {
		super(message);
		this.name = 'SweepError';
	}
}

/** A swap axis, checked, with the tissues resolved. */
export interface ResolvedSwap {
	readonly layer: number;
	readonly choices: readonly (TissueChoice & {readonly record: Tissue})[];
}

/** A spec with every default filled in and every value checked. */
export interface ResolvedSweep {
	readonly doc: PlanDocument;
	/** 0-based index of the swept layer, or null when there is none (no `--fat`, no fat layer). */
	readonly layerIndex: number | null;
	/** Thicknesses of the swept layer, in row order ([the plan's own] when not swept; [] when no layer). */
	readonly fatCm: readonly number[];
	readonly fatSwept: boolean;
	readonly freqMhz: readonly number[];
	readonly freqSwept: boolean;
	/** Beam angles, degrees ([the plan's own] when not swept). */
	readonly angleDeg: readonly number[];
	readonly angleSwept: boolean;
	readonly receive: readonly ReceiveMode[];
	readonly swaps: readonly ResolvedSwap[];
	readonly delta: boolean;
	readonly marginDb: number;
	readonly ladderMhz: readonly number[];
	/** Where the ladder came from. */
	readonly ladderFrom: 'ladder' | 'freq' | 'default';
	/** The plan's own target depth, displayed cm (rows differ when it follows a layer). */
	readonly targetDepthCm: number;
	/** How the plan gives its target: "15 cm" or "10 cm below the top of layer 4 (Liver)". */
	readonly targetRule: string;
	/** The target moves with the layers above it (`targetBelowLayer`). */
	readonly targetFollowsLayer: boolean;
	readonly stepCm: number;
	readonly rowCount: number;
}

/** One tissue the table used, with its values and source, for the header. */
export interface TissueUse {
	/** `layer 2`, or `layer 4 (swap)`. */
	readonly where: string;
	readonly tissue: Tissue;
	/** For a swapped-in tissue: where it came from. */
	readonly from?: string;
}

/** One combination. Numbers are unrounded; the formatters round. */
export interface TableRow {
	/** 1-based row number. */
	readonly index: number;
	/** Thickness of the swept layer, cm; null when there is no swept layer. */
	readonly layerCm: number | null;
	readonly centerMhz: number;
	/** Beam angle from the layer normal, degrees. */
	readonly angleDeg: number;
	readonly receive: ReceiveMode;
	/** Label of the tissue in each swap axis (same order as `sweep.swaps`). */
	readonly swapLabels: readonly string[];
	/** The row's plan document (what `evenecho curve` would be given) and its engine plan. */
	readonly doc: PlanDocument;
	readonly plan: EnginePlan;
	readonly slidersDb: readonly number[];
	readonly masterGainDb: number;
	/** With `delta`: this row minus the standard habitus. */
	readonly delta?: SettingsDelta;
	readonly residualDb: number;
	readonly residualAtCm: number;
	readonly penetrationDepthCm: number | null;
	readonly blockedDepthCm: number | null;
	readonly usableDepthCm: number;
	readonly noiseBudgetDb: number;
	/** This row's target depth, displayed cm (it moves with the layers when the target follows one). */
	readonly targetDepthCm: number;
	/** Highest ladder frequency whose echo from the target depth stays within budget − margin. */
	readonly highestReachingMhz: number | null;
	/** Where that frequency meets the noise floor, displayed cm (null: none reaches, or beyond 40 cm). */
	readonly highestReachingPenetrationCm: number | null;
	readonly warnings: readonly CurveWarning[];
	/** The compensation curve (only with `keepCurves`). */
	readonly curve?: {readonly depthsCm: readonly number[]; readonly compensationDb: readonly number[]};
}

export interface ProtocolTable {
	readonly sweep: ResolvedSweep;
	readonly rows: readonly TableRow[];
	/** Displayed depths of the slider knots, cm (the same on every row). */
	readonly knotDepthsCm: readonly number[];
	/** The standard habitus: the input plan fitted as it is (always computed; shown with `delta`). */
	readonly reference: GainSettings;
	readonly tissues: readonly TissueUse[];
	/** Simplifications that apply to this table, to be printed with it. */
	readonly notes: readonly string[];
}

export interface RunOptions {
	/** Keep each row's compensation curve (the SVG chart needs it; costs memory on big sweeps). */
	readonly keepCurves?: boolean;
	/** Called after each row, synchronously. */
	readonly onProgress?: (done: number, total: number) => void;
}

// ---------------------------------------------------------------------------------------------
// Checking
// ---------------------------------------------------------------------------------------------

/** Formats a number list value for messages: 2.5, not 2.5000000001. */
function show(x: number): string {
	return String(Number(x.toPrecision(12)));
}

function within(l: Limit, x: number): boolean {
	return Number.isFinite(x) && (l.exclusiveMin ? x > l.min : x >= l.min) && x <= l.max;
}

/**
 * Checks a list of numbers for one option: not empty, finite, not negative, in range, no value
 * twice; `unit` goes into the range text.
 */
export function checkNumberList(option: string, values: readonly number[], limit: Limit, unit: string, maxLength = maxTableRows): void {
	const range = `${describeRange(limit, unit)}`;
	if (values.length === 0) throw new SweepError(option, `--${option}: no values given; expected a comma-separated list of numbers ${range}`);
	if (values.length > maxLength) throw new SweepError(option, `--${option}: ${values.length} values; at most ${maxLength} are allowed`);
	const seen = new Set<number>();
	for (const v of values) {
		if (!Number.isFinite(v)) throw new SweepError(option, `--${option}: every value must be a number ${range}`);
		if (v < 0) throw new SweepError(option, `--${option}: ${show(v)} is negative; every value must be a number ${range}`);
		if (!within(limit, v)) throw new SweepError(option, `--${option}: ${show(v)} is out of range; every value must be a number ${range}`);
		if (seen.has(v)) throw new SweepError(option, `--${option}: ${show(v)} is listed twice; give each value once`);
		seen.add(v);
	}
}

/** The record of a tissue choice, or a SweepError naming the option. */
function choiceRecord(layer: number, choice: TissueChoice): Tissue {
	if (typeof choice.tissue === 'string') {
		const found = libraryTissue(choice.tissue);
		if (!found) throw new SweepError('swap', `--swap: unknown tissue "${choice.tissue}" for layer ${layer}; known tissues: ${tissueIds.join(', ')} (or PRESET:M for layer M of a preset)`);
		return found;
	}
	return resolveTissue(choice.tissue);
}

/** Combinations in a sweep, before checking the cap. */
function combinationCount(parts: readonly number[]): number {
	return parts.reduce((a, b) => a * b, 1);
}

/** Fills in the defaults and checks every value; throws {@link SweepError}. */
export function resolveSweep(doc: PlanDocument, spec: SweepSpec = {}): ResolvedSweep {
	const layerCount = doc.layers.length;
	const layerRange = `from 1 to ${layerCount}`;

	// The swept layer.
	let layerIndex: number | null;
	if (spec.layer !== undefined) {
		if (!Number.isInteger(spec.layer) || spec.layer < 1 || spec.layer > layerCount) {
			throw new SweepError('layer', `--layer: must be a whole number ${layerRange} (the plan has ${layerCount} layer${layerCount === 1 ? '' : 's'}; got ${show(spec.layer)})`);
		}
		layerIndex = spec.layer - 1;
	} else {
		layerIndex = fatLayerIndex(doc);
		if (layerIndex === null && spec.fatCm !== undefined) {
			throw new SweepError('layer', `--fat: the plan has no layer of tissue "fat"; choose the layer to sweep with --layer N (${layerRange})`);
		}
	}
	const fatSwept = spec.fatCm !== undefined;
	if (fatSwept) checkNumberList('fat', spec.fatCm!, limits.thicknessCm, 'cm');
	if (layerIndex === layerCount - 1) {
		// The deepest layer extends as far as needed: its thickness means nothing.
		if (fatSwept || spec.layer !== undefined) {
			throw new SweepError('layer', `--${fatSwept ? 'fat' : 'layer'}: layer ${layerIndex + 1} is the deepest layer, which extends as far as needed, so its thickness changes nothing; choose another with --layer N${layerCount > 1 ? ` (from 1 to ${layerCount - 1})` : ''}`);
		}
		layerIndex = null;
	}
	const fatCm = fatSwept ? [...spec.fatCm!] : layerIndex === null ? [] : [doc.layers[layerIndex]!.thicknessCm];

	const freqSwept = spec.freqMhz !== undefined;
	if (freqSwept) checkNumberList('freq', spec.freqMhz!, limits.centerMhz, 'MHz');
	const freqMhz = freqSwept ? [...spec.freqMhz!] : [doc.probe.centerMhz];

	const angleSwept = spec.angleDeg !== undefined;
	if (angleSwept) checkNumberList('angle', spec.angleDeg!, limits.angleDeg, '°');
	const angleDeg = angleSwept ? [...spec.angleDeg!] : [doc.probe.angleDeg ?? 0];

	let receive: ReceiveMode[];
	if (spec.receive !== undefined) {
		if (spec.receive.length === 0 || spec.receive.some((r) => !receiveModes.includes(r))) {
			throw new SweepError('receive', '--receive: must be fundamental, tissue-harmonic (or harmonic), scatterer-harmonic or both');
		}
		if (new Set(spec.receive).size !== spec.receive.length) throw new SweepError('receive', '--receive: each mode once');
		receive = [...spec.receive];
	} else {
		receive = [doc.probe.receive ?? 'fundamental'];
	}

	const swaps: ResolvedSwap[] = [];
	const swapped = new Set<number>();
	for (const s of spec.swaps ?? []) {
		if (!Number.isInteger(s.layer) || s.layer < 1 || s.layer > layerCount) {
			throw new SweepError('swap', `--swap: the layer number must be a whole number ${layerRange} (got ${show(s.layer)})`);
		}
		if (swapped.has(s.layer)) throw new SweepError('swap', `--swap: layer ${s.layer} is swapped twice; list all its tissues in one --swap ${s.layer}=A,B`);
		swapped.add(s.layer);
		if (s.choices.length === 0) throw new SweepError('swap', `--swap: no tissue given for layer ${s.layer}; expected N=TISSUE[,TISSUE…]`);
		const choices = s.choices.map((c) => ({...c, record: choiceRecord(s.layer, c)}));
		const keys = choices.map((c) => JSON.stringify(c.tissue));
		const twice = keys.find((k, i) => keys.indexOf(k) !== i);
		if (twice !== undefined) throw new SweepError('swap', `--swap: layer ${s.layer} lists the same tissue twice (${choices[keys.indexOf(twice)]!.record.label})`);
		swaps.push({layer: s.layer, choices});
	}

	const marginDb = spec.marginDb ?? 0;
	if (!within(marginLimit, marginDb)) throw new SweepError('margin', `--margin: must be a number ${describeRange(marginLimit, 'dB')} (got ${show(marginDb)})`);

	let ladderMhz: number[];
	let ladderFrom: ResolvedSweep['ladderFrom'];
	if (spec.ladderMhz !== undefined) {
		checkNumberList('ladder', spec.ladderMhz, limits.centerMhz, 'MHz', maxLadderLength);
		ladderMhz = [...spec.ladderMhz];
		ladderFrom = 'ladder';
	} else if (freqSwept) {
		ladderMhz = [...freqMhz];
		ladderFrom = 'freq';
	} else {
		ladderMhz = [...defaultLadderMhz];
		ladderFrom = 'default';
	}
	ladderMhz.sort((a, b) => a - b);

	const stepCm = spec.stepCm ?? 0.1;
	if (!(Number.isFinite(stepCm) && stepCm >= 0.01 && stepCm <= 5)) throw new SweepError('step', `--step: must be a number from 0.01 to 5 cm (got ${show(stepCm)})`);

	const parts = [Math.max(1, fatCm.length), freqMhz.length, angleDeg.length, receive.length, ...swaps.map((s) => s.choices.length)];
	const rowCount = combinationCount(parts);
	if (rowCount > maxTableRows) {
		const named = [
			`${fatCm.length} --fat`,
			`${freqMhz.length} --freq`,
			...(angleSwept ? [`${angleDeg.length} --angle`] : []),
			`${receive.length} --receive`,
			...swaps.map((s) => `${s.choices.length} --swap ${s.layer}`),
		].join(' × ');
		throw new SweepError('sweep', `the sweep has ${rowCount.toLocaleString('en-US')} combinations (${named}); a table holds at most ${maxTableRows.toLocaleString('en-US')} rows. Shorten a list.`);
	}

	return {
		doc,
		layerIndex,
		fatCm,
		fatSwept,
		freqMhz,
		freqSwept,
		angleDeg,
		angleSwept,
		receive,
		swaps,
		delta: spec.delta ?? false,
		marginDb,
		ladderMhz,
		ladderFrom,
		targetDepthCm: targetDepthOf(doc, resolvePlan(doc)),
		targetRule: describeTarget(doc, (i) => resolveTissue(doc.layers[i]!.tissue).label),
		targetFollowsLayer: doc.targetBelowLayer !== undefined,
		stepCm,
		rowCount,
	};
}

/** Number of rows a sweep will produce, after checking it (throws {@link SweepError}). */
export function sweepSize(doc: PlanDocument, spec: SweepSpec = {}): number {
	return resolveSweep(doc, spec).rowCount;
}

// ---------------------------------------------------------------------------------------------
// Running
// ---------------------------------------------------------------------------------------------

export interface Combination {
	readonly centerMhz: number;
	readonly angleDeg: number;
	readonly receive: ReceiveMode;
	/** Index into each swap axis' choices. */
	readonly swapPicks: readonly number[];
}

function* combinations(sweep: ResolvedSweep): Generator<Combination> {
	const picks = sweep.swaps.map(() => 0);
	for (const centerMhz of sweep.freqMhz) {
		for (const angleDeg of sweep.angleDeg) {
			for (const receive of sweep.receive) {
				picks.fill(0);
				for (;;) {
					yield {centerMhz, angleDeg, receive, swapPicks: [...picks]};
					let k = picks.length - 1;
					while (k >= 0 && ++picks[k]! >= sweep.swaps[k]!.choices.length) picks[k--] = 0;
					if (k < 0) break;
				}
			}
		}
	}
}

/** One row's place in the sweep: its number, combination and value of the swept layer. */
export interface RowSpot {
	readonly index: number;
	readonly combo: Combination;
	readonly layerCm: number | null;
}

/** Every row's place, in row order (frequency, then receive mode, then swaps, then the layer). */
export function* rowSpots(sweep: ResolvedSweep): Generator<RowSpot> {
	const layerValues: (number | null)[] = sweep.fatCm.length ? [...sweep.fatCm] : [null];
	let index = 0;
	for (const combo of combinations(sweep)) {
		for (const layerCm of layerValues) yield {index: ++index, combo, layerCm};
	}
}

/**
 * Rows that share everything but the frequency: row i belongs to group (i − 1) mod this. Rows of one
 * group share one frequency ladder, so a group is never split between workers.
 */
export function rowsPerFrequency(sweep: ResolvedSweep): number {
	return sweep.rowCount / sweep.freqMhz.length;
}

/** The highest-reaching frequency (and where it meets the noise floor) of each ladder already climbed. */
export type LadderCache = Map<string, {readonly mhz: number | null; readonly penetrationCm: number | null}>;

/** What the engine gives for one row (plain data, so a worker thread can send it back). */
export type RowValues = Omit<TableRow, 'index' | 'layerCm' | 'centerMhz' | 'angleDeg' | 'receive' | 'swapLabels' | 'doc' | 'plan' | 'delta'>;

/** Computes one row; `ladders` keeps the highest-reaching frequency of each ladder already climbed. */
export function rowValues(sweep: ResolvedSweep, spot: RowSpot, ladders: LadderCache, keepCurves = false): RowValues {
	const doc = variantDoc(sweep, spot.combo, spot.layerCm);
	const plan = resolvePlan(doc);
	const r = computeCurve(plan, {stepCm: sweep.stepCm});
	const targetCm = targetDepthOf(doc, plan);
	const key = ladderKey(plan, targetCm);
	let highest = ladders.get(key);
	if (highest === undefined) {
		const ladder = frequencyLadder(plan, sweep.ladderMhz, targetCm, sweep.marginDb);
		const rung = ladder.rungs.find((g) => g.centerMhz === ladder.highestReachingMhz);
		highest = {mhz: ladder.highestReachingMhz, penetrationCm: rung?.penetrationDepthCm ?? null};
		ladders.set(key, highest);
	}
	const settings = settingsOf(r.fit);
	return {
		slidersDb: settings.slidersDb,
		masterGainDb: settings.masterGainDb,
		residualDb: r.fit.residualDb,
		residualAtCm: r.fit.residualAtCm,
		penetrationDepthCm: r.penetrationDepthCm,
		blockedDepthCm: r.blockedDepthCm,
		usableDepthCm: r.usableDepthCm,
		noiseBudgetDb: plan.noiseBudgetDb,
		targetDepthCm: targetCm,
		highestReachingMhz: highest.mhz,
		highestReachingPenetrationCm: highest.penetrationCm,
		// Depth-drawing notes hold for every row of a fat sweep; the tissue table shows the speeds.
		warnings: r.warnings.filter((w) => w.severity === 'warning'),
		...(keepCurves ? {curve: {depthsCm: r.samples.map((s) => s.displayedDepthCm), compensationDb: r.samples.map((s) => s.compensationDb)}} : {}),
	};
}

/**
 * A row from its place and values. Its plan document and engine plan are made again when asked
 * for: a 20,000-row table would otherwise hold 20,000 of each.
 */
export function tableRow(sweep: ResolvedSweep, spot: RowSpot, values: RowValues, reference: GainSettings): TableRow {
	const {combo, layerCm} = spot;
	return {
		index: spot.index,
		layerCm,
		centerMhz: combo.centerMhz,
		angleDeg: combo.angleDeg,
		receive: combo.receive,
		swapLabels: sweep.swaps.map((s, k) => s.choices[combo.swapPicks[k]!]!.record.label),
		get doc() {
			return variantDoc(sweep, combo, layerCm);
		},
		get plan() {
			return resolvePlan(variantDoc(sweep, combo, layerCm));
		},
		...values,
		...(sweep.delta ? {delta: settingsDelta({slidersDb: values.slidersDb, masterGainDb: values.masterGainDb}, reference)} : {}),
	};
}

/** The standard habitus: the input plan fitted as it is. */
export function referenceFitOf(sweep: ResolvedSweep): SliderFit {
	return computeCurve(resolvePlan(sweep.doc), {stepCm: sweep.stepCm}).fit;
}

/** The table around its rows. */
export function tableOf(sweep: ResolvedSweep, rows: readonly TableRow[], referenceFit: SliderFit): ProtocolTable {
	const notes = [ladderSimplification];
	notes.unshift(...new Set(sweep.receive.map(receiveModeNote).filter((n): n is string => n !== null)));
	return {
		sweep,
		rows,
		knotDepthsCm: referenceFit.sliders.map((s) => s.depthCm),
		reference: settingsOf(referenceFit),
		tissues: tissueUses(sweep),
		notes,
	};
}

/** The plan document of one combination. */
export function variantDoc(sweep: ResolvedSweep, combo: Combination, layerCm: number | null): PlanDocument {
	const doc = sweep.doc;
	const layers = doc.layers.map((l, i) => {
		let out = l;
		const axis = sweep.swaps.findIndex((s) => s.layer === i + 1);
		if (axis >= 0) {
			// A swapped-in tissue brings its own α0: a measurement made on the plan's tissue does not apply.
			const {measuredAlpha: _measured, ...rest} = out;
			out = {...rest, tissue: sweep.swaps[axis]!.choices[combo.swapPicks[axis]!]!.tissue};
		}
		if (i === sweep.layerIndex && layerCm !== null && layerCm !== l.thicknessCm) out = {...out, thicknessCm: layerCm};
		return out;
	});
	// An unswept angle of 0 stays absent, so a plan without one keeps its exact document.
	const angle = sweep.angleSwept || doc.probe.angleDeg !== undefined ? {angleDeg: combo.angleDeg} : {};
	return {...doc, layers, probe: {...doc.probe, centerMhz: combo.centerMhz, ...angle, receive: combo.receive}};
}

/** Everything the ladder depends on except the frequency. */
export function ladderKey(plan: EnginePlan, targetCm: number): string {
	return JSON.stringify([targetCm, plan.layers.map((l) => [l.tissue.label, l.tissue.alphaDbPerCmMhz, l.tissue.exponent, l.tissue.speedMps, l.tissue.densityKgM3, l.thicknessCm]), plan.probe.receive, plan.probe.bandwidthFraction, plan.probe.spectrumSteepness, plan.probe.angleDeg, plan.noiseBudgetDb]);
}

export function tissueUses(sweep: ResolvedSweep): TissueUse[] {
	const swapped = new Set(sweep.swaps.map((s) => s.layer));
	// A swapped layer never carries the plan's own tissue in any row: list only its choices.
	const out: TissueUse[] = sweep.doc.layers.flatMap((l, i) =>
		swapped.has(i + 1) ? [] : [{where: `layer ${i + 1}`, tissue: resolveLayer(l, sweep.doc.display.assumedSpeedMps).tissue}],
	);
	for (const s of sweep.swaps) {
		for (const c of s.choices) out.push({where: `layer ${s.layer} (swap)`, tissue: c.record, ...(c.from ? {from: c.from} : {})});
	}
	return out;
}

/** Runs a checked sweep. Pure and synchronous; `onProgress` is called after every row. */
export function runSweep(sweep: ResolvedSweep, options: RunOptions = {}): ProtocolTable {
	const referenceFit = referenceFitOf(sweep);
	const reference = settingsOf(referenceFit);
	const ladders: LadderCache = new Map();
	const rows: TableRow[] = [];
	for (const spot of rowSpots(sweep)) {
		rows.push(tableRow(sweep, spot, rowValues(sweep, spot, ladders, options.keepCurves), reference));
		options.onProgress?.(rows.length, sweep.rowCount);
	}
	return tableOf(sweep, rows, referenceFit);
}

/** Checks and runs a sweep in one step (throws {@link SweepError} on a bad spec). */
export function buildTable(doc: PlanDocument, spec: SweepSpec = {}, options: RunOptions = {}): ProtocolTable {
	return runSweep(resolveSweep(doc, spec), options);
}
