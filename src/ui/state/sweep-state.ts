/**
 * The fat-thickness sweep of step 5 as plain data: whether it is open, the thickness list, what is
 * being typed into it, the cursor row and the first scrolled column. Pure; no React or Ink here.
 */
import {fatLayerToSweep} from '../../plan/fat-layer.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {maxSvgLines} from '../../table/table-svg.js';

/** Most thicknesses the console sweeps at once (the SVG chart draws one line per value, so all four formats work). */
export const maxSweepValues = maxSvgLines;

/** Longest list text accepted while typing. */
export const sweepTextMax = 80;

/** Default thicknesses, cm, for displays at least {@link deepFromCm} deep, and for shallower ones. */
export const deepDefaultCm: readonly number[] = [1, 2, 3, 4, 6, 8];
export const shallowDefaultCm: readonly number[] = [0.25, 0.5, 0.75, 1, 1.5, 2];
export const deepFromCm = 8;

export interface SweepState {
	readonly isOpen: boolean;
	/** The list the user typed and the console accepted; null for the default around the plan's own thickness. */
	readonly list: {readonly text: string; readonly fatCm: readonly number[]} | null;
	/** Text being typed into the list field, or null when not typing. */
	readonly typing: {readonly text: string; readonly isFresh: boolean} | null;
	/** Why the typed list was refused, shown beside the field until the next key. */
	readonly refusal: string | null;
	/** Sliders and master as differences from the plan as it is (the unswept plan). */
	readonly isDelta: boolean;
	/** The row under the cursor, 0-based. */
	readonly row: number;
	/** The first scrolled column (the thickness column always stays), 0-based. */
	readonly column: number;
}

export const closedSweep: SweepState = {
	isOpen: false,
	list: null,
	typing: null,
	refusal: null,
	isDelta: false,
	row: 0,
	column: 0,
};

/**
 * The default list: 1, 2, 3, 4, 6, 8 cm for displays 8 cm deep or more, 0.25, 0.5, 0.75, 1, 1.5,
 * 2 cm for shallower ones, with the plan's own thickness added in order when it is not there.
 */
export function defaultFatCm(doc: PlanDocument): number[] {
	const base = doc.display.depthCm >= deepFromCm ? deepDefaultCm : shallowDefaultCm;
	const i = fatLayerToSweep(doc);
	const own = i === null ? undefined : doc.layers[i]!.thicknessCm;
	const values = own === undefined || base.includes(own) ? [...base] : [...base, own];
	return values.sort((a, b) => a - b);
}

/** "1,2,3,4,5,6,8": a list as the field shows it. */
export function listText(values: readonly number[]): string {
	return values.map((v) => String(Number(v.toFixed(6)))).join(',');
}

/** The thicknesses the view shows for this plan. */
export function sweepFatCm(sweep: SweepState, doc: PlanDocument): readonly number[] {
	return sweep.list?.fatCm ?? defaultFatCm(doc);
}

/** The text of the list field: what is being typed, else the list shown. */
export function sweepFieldText(sweep: SweepState, doc: PlanDocument): string {
	if (sweep.typing) return sweep.typing.text;
	return sweep.list?.text ?? listText(defaultFatCm(doc));
}
