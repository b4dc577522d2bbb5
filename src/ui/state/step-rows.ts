/**
 * The selectable rows of each step, derived from the state (pure). The reducer moves the cursor
 * over these and the views render them, so both always agree on what row N is.
 */
import type {ConsoleState, StepId} from './console-state.js';
import type {ChoiceKey, NumberKey} from './plan-fields.js';
import type {StartingPoint} from './starting-point.js';

export type RowAction =
	| 'add-layer'
	| 'pick-tissue'
	| 'make-custom'
	| 'fill-reference'
	| 'save'
	| 'export'
	| 'sweep'
	| 'refine';

export type Row =
	| {readonly kind: 'number'; readonly id: string; readonly key: NumberKey; readonly index: number}
	| {readonly kind: 'choice'; readonly id: string; readonly key: ChoiceKey}
	| {readonly kind: 'tissue-label'; readonly id: string; readonly index: number}
	| {readonly kind: 'start'; readonly id: string; readonly point: StartingPoint}
	| {readonly kind: 'layer'; readonly id: string; readonly index: number}
	| {readonly kind: 'action'; readonly id: string; readonly action: RowAction; readonly label: string}
	| {readonly kind: 'slider'; readonly id: string; readonly index: number};

const num = (key: NumberKey, index = 0): Row => ({kind: 'number', id: `n:${key}:${index}`, key, index});
const choice = (key: ChoiceKey): Row => ({kind: 'choice', id: `c:${key}`, key});
const action = (a: RowAction, label: string): Row => ({kind: 'action', id: `a:${a}`, action: a, label});

function stackRows(s: ConsoleState): Row[] {
	const i = s.openLayer;
	if (i !== null && s.doc.layers[i]) {
		const rows: Row[] = [action('pick-tissue', 'Tissue'), num('thickness', i), num('measuredAlpha', i)];
		if (s.doc.layers[i].measuredAlpha) rows.push(num('measuredLow', i), num('measuredHigh', i));
		if (typeof s.doc.layers[i].tissue === 'string')
			rows.push(action('make-custom', 'Edit these values as a custom tissue'));
		else
			rows.push(
				{kind: 'tissue-label', id: `t:label:${i}`, index: i},
				num('speedMps', i),
				num('densityKgM3', i),
				num('alphaDbPerCmMhz', i),
				num('exponent', i),
			);
		return rows;
	}
	return [
		num('fat'),
		...s.doc.layers.map((_, k): Row => ({kind: 'layer', id: `l:${k}`, index: k})),
		action('add-layer', 'Add a layer at the bottom'),
	];
}

function probeRows(s: ConsoleState): Row[] {
	const rows: Row[] = [
		num('centerMhz'),
		num('bandwidthFraction'),
		num('spectrumSteepness'),
		choice('harmonic'),
		num('angleDeg'),
		num('scattererExponent'),
		num('depthCm'),
		num('targetLayer'),
		num('target'),
		num('assumedSpeedMps'),
		num('sliderCount'),
		num('sliderMinDb'),
		num('sliderMaxDb'),
		num('rampDbPerCmMhz'),
		choice('knots'),
		choice('ends'),
		num('masterMinDb'),
		num('masterMaxDb'),
		num('masterBaseDb'),
		choice('noiseSource'),
	];
	if (s.doc.phantomCalibration) rows.push(num('phantomCenterMhz'), num('phantomDepthCm'), num('phantomAlpha'));
	else rows.push(num('noiseBudgetDb'));
	rows.push(choice('budgetReceive'));
	return rows;
}

function usualRows(s: ConsoleState): Row[] {
	const rows: Row[] = [choice('reference')];
	if (!s.doc.reference) return rows;
	rows.push(num('refMasterDb'));
	s.doc.reference.slidersDb.forEach((_, k) => rows.push(num('refSliderDb', k)));
	rows.push(action('fill-reference', "Refill from the starting plan's standard layers"));
	return rows;
}

function curveRows(s: ConsoleState): Row[] {
	const rows: Row[] = Array.from(
		{length: s.doc.sliders.count},
		(_, k): Row => ({kind: 'slider', id: `s:${k}`, index: k}),
	);
	rows.push(
		action('save', 'Save as a preset'),
		action('export', 'Export JSON + text summary'),
		action('sweep', 'Sweep over fat thickness'),
		action('refine', 'Refine from an image'),
	);
	return rows;
}

export function rowsOf(s: ConsoleState, step: StepId = s.step): Row[] {
	switch (step) {
		case 'start':
			return s.startingPoints.map((point): Row => ({kind: 'start', id: `p:${point.id}`, point}));
		case 'stack':
			return stackRows(s);
		case 'probe':
			return probeRows(s);
		case 'usual':
			return usualRows(s);
		case 'curve':
			return curveRows(s);
	}
}

/** The row under the cursor of the current step (undefined for an empty list). */
export function currentRow(s: ConsoleState): Row | undefined {
	const rows = rowsOf(s);
	return rows[Math.min(s.cursors[s.step], rows.length - 1)];
}
