/**
 * The words and numbers a row shows, pure, so views stay thin and tests can check them directly.
 */
import {libraryTissue} from '../../engine/tissue-library.js';
import type {Tissue} from '../../engine/types.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {describeRange} from '../../plan/plan-schema.js';
import {resolveLayer} from '../../plan/resolve-plan.js';
import type {ConsoleState} from './console-state.js';
import {formatNumber} from './number-field.js';
import {choiceFields, numberFields} from './plan-fields.js';
import type {StartingPoint} from './starting-point.js';
import type {Row} from './step-rows.js';

export interface RowText {
	readonly label: string;
	readonly value: string;
}

const kindWord = {demo: 'built in', template: 'template', preset: 'saved'} as const;

/** Words added to a starting point's name when another one has the same name. */
const sameNameMark = {demo: 'built in', template: 'template', preset: 'your preset'} as const;

const nameKey = (name: string) => name.trim().toLowerCase();

/** A starting point's name as listed: marked "(your preset)" / "(template)" when another one shares it. */
export function startingPointLabel(point: StartingPoint, all: readonly StartingPoint[]): string {
	const isShared = all.some((p) => p !== point && nameKey(p.name) === nameKey(point.name));
	return isShared ? `${point.name} (${sameNameMark[point.kind]})` : point.name;
}

/** The tissue a layer uses, with an α0 measured for this patient in place of the library's. */
export function tissueOf(doc: PlanDocument, index: number): Tissue | undefined {
	const l = doc.layers[index];
	if (l === undefined) return undefined;
	if (typeof l.tissue === 'string' && !libraryTissue(l.tissue)) return undefined;
	return resolveLayer(l, doc.display.assumedSpeedMps).tissue;
}

/** "a0 0.6  n 1  c 1440  rho 911" with the units left to the column header. */
export function tissueNumbers(t: Tissue): string {
	return `a0 ${t.alphaDbPerCmMhz}  n ${t.exponent}  c ${t.speedMps}  rho ${t.densityKgM3}`;
}

/** One decimal, or two when the thickness has them: 5.0, 1.25. */
export function thicknessText(cm: number): string {
	return Number.isInteger(Math.round(cm * 1000) / 100) ? cm.toFixed(1) : cm.toFixed(2);
}

export function numberLabel(row: Row & {kind: 'number'}, doc?: PlanDocument): string {
	if (row.key === 'refSliderDb') return `Usual slider ${row.index + 1}`;
	if (row.key === 'target' && doc?.targetBelowLayer) return `Target below layer ${doc.targetBelowLayer.layer} top`;
	if (row.key === 'target' && doc && doc.targetDepthCm === undefined) return 'Target depth (= display)';
	return numberFields[row.key].spec.label;
}

export function rowText(s: ConsoleState, row: Row): RowText {
	switch (row.kind) {
		case 'number': {
			const field = numberFields[row.key];
			const v = field.get(s.doc, row.index);
			const unit = field.spec.unit ? ` ${field.spec.unit}` : '';
			if (v === undefined)
				return {label: numberLabel(row, s.doc), value: row.key === 'fat' ? 'no fat layer (Enter adds one)' : '-'};
			// Columns of fixed-decimal values (the usual gains) line up on the decimal point.
			const text = formatNumber(v, field.spec);
			return {label: numberLabel(row, s.doc), value: `${field.spec.isFixed ? text.padStart(6) : text}${unit}`};
		}
		case 'choice': {
			const field = choiceFields[row.key];
			const current = field.get(s.doc);
			return {label: field.label, value: field.options.find((o) => o.value === current)?.text ?? current};
		}
		case 'tissue-label': {
			const t = s.doc.layers[row.index]?.tissue;
			return {label: 'Name', value: typeof t === 'string' ? t : (t?.label ?? '')};
		}
		case 'start':
			return {label: startingPointLabel(row.point, s.startingPoints), value: kindWord[row.point.kind]};
		case 'layer': {
			const l = s.doc.layers[row.index]!;
			const t = tissueOf(s.doc, row.index);
			const isLast = row.index === s.doc.layers.length - 1;
			// "screen": measured on the screen (displayed); "true": the real thickness. "+": goes on below.
			const mode = l.thicknessAs === 'displayed' ? 'screen' : 'true';
			return {
				label: `${row.index + 1} ${t?.label ?? '?'}`,
				value: `${thicknessText(l.thicknessCm)} cm ${mode}${isLast ? ' +' : ''}`,
			};
		}
		case 'action':
			if (row.action === 'pick-tissue' && s.openLayer !== null)
				return {label: 'Tissue', value: `${tissueOf(s.doc, s.openLayer)?.label ?? '?'} (Enter to change)`};
			return {label: `[ ${row.label} ]`, value: ''};
		case 'slider':
			return {label: `Slider ${row.index + 1}`, value: ''};
	}
}

/** The allowed range of the row being typed into, for the status line. */
export function rangeHint(row: Row | undefined): string | undefined {
	if (row?.kind === 'number') {
		const spec = numberFields[row.key].spec;
		return `${numberLabel(row)}: ${spec.integer ? 'a whole number ' : ''}${describeRange(spec.limit, spec.unit)}`;
	}
	if (row?.kind === 'tissue-label') return 'Tissue name: 1 to 60 characters';
	return undefined;
}
