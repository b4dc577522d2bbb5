/**
 * Runs a checked sweep (sweep-spec.ts): each combination fitted like `evenecho curve`, with the
 * highest frequency that reaches the target, into a table the formatters (table-markdown, table-csv,
 * table-json, table-svg) print. The command line and the console call {@link runSweep}, or
 * {@link buildTable} to check and run in one step; sweep-parallel.ts spreads the same rows over threads.
 *
 * Pure and synchronous: no file system, no process, no clock.
 */
import {ladderSimplification, receiveModeNote} from '../engine/model-notes.js';
import {computeCurve, curveFacts, curvePhysics, fitFacts, type CurveFacts} from '../engine/compensation-curve.js';
import {frequencyLadder} from '../engine/frequency-ladder.js';
import {settingsDelta, settingsOf, type GainSettings, type SettingsDelta} from '../engine/plan-difference.js';
import type {FitMemory} from '../engine/slider-fit.js';
import type {CurveWarning, EnginePlan, ReceiveMode, SliderFit, Tissue} from '../engine/types.js';
import type {PlanDocument} from '../plan/plan-schema.js';
import {resolveLayer, resolvePlan} from '../plan/resolve-plan.js';
import {targetDepthOf} from '../plan/plan-target.js';
import {resolveSweep, type ResolvedSweep, type SweepSpec} from './sweep-spec.js';

/** One tissue the table used, with its values and source, for the header. */
export interface TissueUse {
	/** `layer 2`, or `layer 4 (swap)`. */
	readonly where: string;
	/** The layer, 1-based, and whether the tissue is one of its swaps rather than the plan's own. */
	readonly layer: number;
	readonly swapped: boolean;
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

/** The row group (0-based) of the row numbered `index`: its rows share a frequency ladder. */
export function rowGroup(sweep: ResolvedSweep, index: number): number {
	return (index - 1) % rowsPerFrequency(sweep);
}

/** The highest-reaching frequency (and where it meets the noise floor) of each ladder already climbed. */
export type LadderCache = Map<string, HighestReaching>;

/** What the engine gives for one row (plain data, so a worker thread can send it back). */
export type RowValues = Omit<
	TableRow,
	'index' | 'layerCm' | 'centerMhz' | 'angleDeg' | 'receive' | 'swapLabels' | 'doc' | 'plan' | 'delta'
>;

/**
 * The physics of one row: everything but the slider fit and the frequency ladder (plain data, so a
 * worker thread can send it back). The fit needs only these facts and the row's plan (rowFromPhysics).
 */
export interface RowPhysics {
	readonly facts: CurveFacts;
	readonly targetDepthCm: number;
	readonly noiseBudgetDb: number;
	/** The row's highest-reaching frequency, when the thread that worked out the physics climbed its ladder. */
	readonly highest?: HighestReaching;
}

/** The highest frequency of a row's ladder that reaches its target, and where it meets the noise floor. */
export interface HighestReaching {
	readonly mhz: number | null;
	readonly penetrationCm: number | null;
}

/** The engine plan of one row. */
export function rowPlan(sweep: ResolvedSweep, spot: RowSpot): EnginePlan {
	return resolvePlan(variantDoc(sweep, spot.combo, spot.layerCm), sweep.scanner);
}

/** Works out one row's physics. */
export function rowPhysics(sweep: ResolvedSweep, spot: RowSpot, plan: EnginePlan = rowPlan(sweep, spot)): RowPhysics {
	const facts = curveFacts(curvePhysics(plan, {stepCm: sweep.stepCm, band: false, samples: false}), plan);
	return {facts, targetDepthCm: rowTarget(sweep, plan), noiseBudgetDb: plan.noiseBudgetDb};
}

/**
 * A row's target depth. The target rule is the sweep's own document's: a row's document differs only
 * in its layers and probe (variantDoc), which the rule reads from the row's plan.
 */
function rowTarget(sweep: ResolvedSweep, plan: EnginePlan): number {
	return targetDepthOf(sweep.doc, plan);
}

/** A row's highest-reaching frequency; `ladders` keeps that of each ladder already climbed. */
export function highestReaching(
	sweep: ResolvedSweep,
	plan: EnginePlan,
	targetCm: number,
	ladders: LadderCache,
): HighestReaching {
	const key = ladderKey(plan, targetCm);
	let highest = ladders.get(key);
	if (highest === undefined) {
		const ladder = frequencyLadder(plan, sweep.ladderMhz, targetCm, sweep.marginDb);
		const rung = ladder.rungs.find((g) => g.centerMhz === ladder.highestReachingMhz);
		highest = {mhz: ladder.highestReachingMhz, penetrationCm: rung?.penetrationDepthCm ?? null};
		ladders.set(key, highest);
	}
	return highest;
}

/** Climbs the frequency ladder of a row's group (its rows share one ladder) into `ladders`. */
export function climbLadder(sweep: ResolvedSweep, spot: RowSpot, ladders: LadderCache): HighestReaching {
	const plan = rowPlan(sweep, spot);
	return highestReaching(sweep, plan, rowTarget(sweep, plan), ladders);
}

/**
 * Each row group's fit memory (fitSliders): a group's rows differ only in frequency and are fitted in
 * row order by one thread whatever the number of threads, so each starts from the fit before it the
 * same way on any machine.
 */
export type FitMemories = Map<number, FitMemory>;

/** The fit memory of a row's group. */
export function fitMemoryOf(memories: FitMemories, sweep: ResolvedSweep, spot: RowSpot): FitMemory {
	const group = rowGroup(sweep, spot.index);
	let memory = memories.get(group);
	if (!memory) memories.set(group, (memory = {}));
	return memory;
}

/** Fits one row on its physics (worked out here or on another thread). */
export function rowFromPhysics(
	physics: RowPhysics,
	highest: HighestReaching,
	plan: EnginePlan,
	keepCurves = false,
	memory?: FitMemory,
): RowValues {
	const facts = physics.facts;
	const {fit, warnings} = fitFacts(facts, plan, memory);
	const settings = settingsOf(fit);
	return {
		slidersDb: settings.slidersDb,
		masterGainDb: settings.masterGainDb,
		residualDb: fit.residualDb,
		residualAtCm: fit.residualAtCm,
		penetrationDepthCm: facts.penetrationDepthCm,
		blockedDepthCm: facts.blockedDepthCm,
		usableDepthCm: facts.usableDepthCm,
		noiseBudgetDb: physics.noiseBudgetDb,
		targetDepthCm: physics.targetDepthCm,
		highestReachingMhz: highest.mhz,
		highestReachingPenetrationCm: highest.penetrationCm,
		// Depth-drawing notes hold for every row of a fat sweep; the tissue table shows the speeds.
		warnings: warnings.filter((w) => w.severity === 'warning'),
		...(keepCurves ? {curve: {depthsCm: [...facts.depths], compensationDb: Array.from(facts.compensationDb)}} : {}),
	};
}

/**
 * Computes one row; `ladders` keeps the highest-reaching frequency of each ladder already climbed,
 * `memories` each group's fit memory.
 */
export function rowValues(
	sweep: ResolvedSweep,
	spot: RowSpot,
	ladders: LadderCache,
	memories: FitMemories,
	keepCurves = false,
): RowValues {
	const plan = rowPlan(sweep, spot);
	const physics = rowPhysics(sweep, spot, plan);
	const highest = highestReaching(sweep, plan, physics.targetDepthCm, ladders);
	return rowFromPhysics(physics, highest, plan, keepCurves, fitMemoryOf(memories, sweep, spot));
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
			return resolvePlan(variantDoc(sweep, combo, layerCm), sweep.scanner);
		},
		...values,
		...(sweep.delta
			? {delta: settingsDelta({slidersDb: values.slidersDb, masterGainDb: values.masterGainDb}, reference)}
			: {}),
	};
}

/** The standard habitus: the input plan fitted as it is. */
export function referenceFitOf(sweep: ResolvedSweep): SliderFit {
	return computeCurve(resolvePlan(sweep.doc, sweep.scanner), {stepCm: sweep.stepCm, band: false}).fit;
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
	return JSON.stringify([
		targetCm,
		plan.layers.map((l) => [
			l.tissue.label,
			l.tissue.alphaDbPerCmMhz,
			l.tissue.exponent,
			l.tissue.speedMps,
			l.tissue.densityKgM3,
			l.thicknessCm,
		]),
		plan.probe.receive,
		plan.probe.bandwidthFraction,
		plan.probe.spectrumSteepness,
		plan.probe.angleDeg,
		plan.noiseBudgetDb,
	]);
}

export function tissueUses(sweep: ResolvedSweep): TissueUse[] {
	const swapped = new Set(sweep.swaps.map((s) => s.layer));
	// A swapped layer never carries the plan's own tissue in any row: list only its choices.
	const out: TissueUse[] = sweep.doc.layers.flatMap((l, i) =>
		swapped.has(i + 1)
			? []
			: [
					{
						where: `layer ${i + 1}`,
						layer: i + 1,
						swapped: false,
						tissue: resolveLayer(l, sweep.doc.display.assumedSpeedMps).tissue,
					},
				],
	);
	for (const s of sweep.swaps) {
		for (const c of s.choices)
			out.push({
				where: `layer ${s.layer} (swap)`,
				layer: s.layer,
				swapped: true,
				tissue: c.record,
				...(c.from ? {from: c.from} : {}),
			});
	}
	return out;
}

/** A sweep's rows in row order on this thread, each worked out when asked for; `onProgress` after every row. */
export function* sweepRows(
	sweep: ResolvedSweep,
	reference: GainSettings,
	options: RunOptions = {},
): Generator<TableRow> {
	const ladders: LadderCache = new Map();
	const memories: FitMemories = new Map();
	let done = 0;
	for (const spot of rowSpots(sweep)) {
		const row = tableRow(sweep, spot, rowValues(sweep, spot, ladders, memories, options.keepCurves), reference);
		options.onProgress?.(++done, sweep.rowCount);
		yield row;
	}
}

/** Runs a checked sweep. Pure and synchronous; `onProgress` is called after every row. */
export function runSweep(sweep: ResolvedSweep, options: RunOptions = {}): ProtocolTable {
	const referenceFit = referenceFitOf(sweep);
	return tableOf(sweep, [...sweepRows(sweep, settingsOf(referenceFit), options)], referenceFit);
}

/** Checks and runs a sweep in one step (throws {@link SweepError} on a bad spec). */
export function buildTable(doc: PlanDocument, spec: SweepSpec = {}, options: RunOptions = {}): ProtocolTable {
	return runSweep(resolveSweep(doc, spec), options);
}
