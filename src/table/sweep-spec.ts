/**
 * What a protocol table sweeps, checked: one plan over habitus (the thickness of its subcutaneous
 * layer), probe centre frequency, beam angle, receive mode and tissue swaps. The command line's
 * option parsing and the console's list field need only this side; sweep-runner.ts computes the rows.
 *
 * Pure: no file system, no process, no clock.
 */
import {libraryTissue, tissueIds} from '../engine/tissue-library.js';
import type {ReceiveMode, Tissue} from '../engine/types.js';
import {fatLayerIndex} from '../plan/fat-layer.js';
import {
	describeRange,
	limits,
	receiveModes,
	resolveTissue,
	type Limit,
	type LayerDocument,
	type PlanDocument,
} from '../plan/plan-schema.js';
import {resolvePlan, type PlanScanner} from '../plan/resolve-plan.js';
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
	/** The scanner profile the plan names, looked up by the caller; every row then uses it. */
	readonly scanner?: PlanScanner;
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
export function checkNumberList(
	option: string,
	values: readonly number[],
	limit: Limit,
	unit: string,
	maxLength = maxTableRows,
): void {
	const range = `${describeRange(limit, unit)}`;
	if (values.length === 0)
		throw new SweepError(option, `--${option}: no values given; expected a comma-separated list of numbers ${range}`);
	if (values.length > maxLength)
		throw new SweepError(option, `--${option}: ${values.length} values; at most ${maxLength} are allowed`);
	const seen = new Set<number>();
	for (const v of values) {
		if (!Number.isFinite(v)) throw new SweepError(option, `--${option}: every value must be a number ${range}`);
		if (v < 0)
			throw new SweepError(option, `--${option}: ${show(v)} is negative; every value must be a number ${range}`);
		if (!within(limit, v))
			throw new SweepError(option, `--${option}: ${show(v)} is out of range; every value must be a number ${range}`);
		if (seen.has(v)) throw new SweepError(option, `--${option}: ${show(v)} is listed twice; give each value once`);
		seen.add(v);
	}
}

/** The record of a tissue choice, or a SweepError naming the option. */
function choiceRecord(layer: number, choice: TissueChoice): Tissue {
	if (typeof choice.tissue === 'string') {
		const found = libraryTissue(choice.tissue);
		if (!found)
			throw new SweepError(
				'swap',
				`--swap: unknown tissue "${choice.tissue}" for layer ${layer}; known tissues: ` +
					`${tissueIds.join(', ')} (or PRESET:M for layer M of a preset)`,
			);
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
			throw new SweepError(
				'layer',
				`--layer: must be a whole number ${layerRange} (the plan has ${layerCount} layer${layerCount === 1 ? '' : 's'}; ` +
					`got ${show(spec.layer)})`,
			);
		}
		layerIndex = spec.layer - 1;
	} else {
		layerIndex = fatLayerIndex(doc);
		if (layerIndex === null && spec.fatCm !== undefined) {
			throw new SweepError(
				'layer',
				`--fat: the plan has no layer of tissue "fat"; choose the layer to sweep with --layer N (${layerRange})`,
			);
		}
	}
	const fatSwept = spec.fatCm !== undefined;
	if (fatSwept) checkNumberList('fat', spec.fatCm!, limits.thicknessCm, 'cm');
	if (layerIndex === layerCount - 1) {
		// The deepest layer extends as far as needed: its thickness means nothing.
		if (fatSwept || spec.layer !== undefined) {
			throw new SweepError(
				'layer',
				`--${fatSwept ? 'fat' : 'layer'}: layer ${layerIndex + 1} is the deepest layer, which ` +
					'extends as far as needed, so its thickness changes nothing; choose another with --layer ' +
					`N${layerCount > 1 ? ` (from 1 to ${layerCount - 1})` : ''}`,
			);
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
			throw new SweepError(
				'receive',
				'--receive: must be fundamental, tissue-harmonic (or harmonic), scatterer-harmonic or both',
			);
		}
		if (new Set(spec.receive).size !== spec.receive.length)
			throw new SweepError('receive', '--receive: each mode once');
		receive = [...spec.receive];
	} else {
		receive = [doc.probe.receive ?? 'fundamental'];
	}

	const swaps: ResolvedSwap[] = [];
	const swapped = new Set<number>();
	for (const s of spec.swaps ?? []) {
		if (!Number.isInteger(s.layer) || s.layer < 1 || s.layer > layerCount) {
			throw new SweepError(
				'swap',
				`--swap: the layer number must be a whole number ${layerRange} (got ${show(s.layer)})`,
			);
		}
		if (swapped.has(s.layer))
			throw new SweepError(
				'swap',
				`--swap: layer ${s.layer} is swapped twice; list all its tissues in one --swap ${s.layer}=A,B`,
			);
		swapped.add(s.layer);
		if (s.choices.length === 0)
			throw new SweepError('swap', `--swap: no tissue given for layer ${s.layer}; expected N=TISSUE[,TISSUE…]`);
		const choices = s.choices.map((c) => ({...c, record: choiceRecord(s.layer, c)}));
		const keys = choices.map((c) => JSON.stringify(c.tissue));
		const twice = keys.find((k, i) => keys.indexOf(k) !== i);
		if (twice !== undefined)
			throw new SweepError(
				'swap',
				`--swap: layer ${s.layer} lists the same tissue twice (${choices[keys.indexOf(twice)]!.record.label})`,
			);
		swaps.push({layer: s.layer, choices});
	}

	const marginDb = spec.marginDb ?? 0;
	if (!within(marginLimit, marginDb))
		throw new SweepError(
			'margin',
			`--margin: must be a number ${describeRange(marginLimit, 'dB')} (got ${show(marginDb)})`,
		);

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
	if (!(Number.isFinite(stepCm) && stepCm >= 0.01 && stepCm <= 5))
		throw new SweepError('step', `--step: must be a number from 0.01 to 5 cm (got ${show(stepCm)})`);

	const parts = [
		Math.max(1, fatCm.length),
		freqMhz.length,
		angleDeg.length,
		receive.length,
		...swaps.map((s) => s.choices.length),
	];
	const rowCount = combinationCount(parts);
	if (rowCount > maxTableRows) {
		const named = [
			`${fatCm.length} --fat`,
			`${freqMhz.length} --freq`,
			...(angleSwept ? [`${angleDeg.length} --angle`] : []),
			`${receive.length} --receive`,
			...swaps.map((s) => `${s.choices.length} --swap ${s.layer}`),
		].join(' × ');
		throw new SweepError(
			'sweep',
			`the sweep has ${rowCount.toLocaleString('en-US')} combinations (${named}); a table ` +
				`holds at most ${maxTableRows.toLocaleString('en-US')} rows. Shorten a list.`,
		);
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
