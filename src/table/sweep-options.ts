/**
 * Turns typed text (command-line options, console fields) into a {@link SweepSpec}. Pure: preset
 * look-ups for `--swap N=PRESET:M` go through a function the caller passes in.
 *
 * Every failure is a {@link SweepError} whose message names the option and the allowed range.
 */
import type {Limit} from '../plan/plan-schema.js';
import {describeRange, limits} from '../plan/plan-schema.js';
import {
	checkNumberList,
	marginLimit,
	maxLadderLength,
	maxTableRows,
	SweepError,
	type LayerSwap,
	type ReceiveMode,
	type SweepSpec,
	type TissueChoice,
} from './sweep-spec.js';

const numberPattern = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)$/;

/** One number in plain decimal notation ("2", "2.5", ".5"), or NaN. */
export function parseDecimal(text: string): number {
	const t = text.trim();
	return numberPattern.test(t) ? Number(t) : Number.NaN;
}

/**
 * "1,2,4,6,8" → [1, 2, 4, 6, 8], or "1:8:0.5" (from:to:step, both ends included when the steps
 * land on them) → [1, 1.5, …, 8]; checked against the limit.
 */
export function parseNumberList(
	option: string,
	text: string,
	limit: Limit,
	unit: string,
	maxLength = maxTableRows,
): number[] {
	const range = describeRange(limit, unit);
	const form =
		`a comma-separated list of numbers ${range} (e.g. ` +
		`${option === 'fat' ? '1,2,4,6,8' : option === 'angle' ? '0,15,30' : '2.5,3.5,5'}) or ` +
		'from:to:step';
	const trimmed = text.trim();
	if (trimmed === '') throw new SweepError(option, `--${option}: no values given; expected ${form}`);
	let values: number[];
	if (trimmed.includes(':')) {
		const parts = trimmed.split(':').map(parseDecimal);
		if (parts.length !== 3 || parts.some(Number.isNaN))
			throw new SweepError(option, `--${option}: "${trimmed}" is not a from:to:step range; expected ${form}`);
		const [from, to, step] = parts as [number, number, number];
		if (!(step > 0) || to < from)
			throw new SweepError(option, `--${option}: "${trimmed}" needs a step above 0 and to ≥ from; expected ${form}`);
		const count = Math.floor((to - from) / step + 1e-9) + 1;
		if (count > maxLength)
			throw new SweepError(option, `--${option}: "${trimmed}" makes ${count} values; at most ${maxLength} are allowed`);
		values = Array.from({length: count}, (_, i) => Number((from + i * step).toFixed(6)));
	} else {
		values = trimmed.split(',').map((raw) => {
			const item = raw.trim();
			if (item === '') throw new SweepError(option, `--${option}: empty entry in "${text}"; expected ${form}`);
			const v = parseDecimal(item);
			if (Number.isNaN(v)) throw new SweepError(option, `--${option}: "${item}" is not a number; expected ${form}`);
			return v;
		});
	}
	checkNumberList(option, values, limit, unit, maxLength);
	return values;
}

/** A 1-based layer number. */
export function parseLayerNumber(option: string, text: string): number {
	const t = text.trim();
	if (!/^\d+$/.test(t))
		throw new SweepError(
			option,
			`--${option}: must be a whole layer number from 1 (the layer just under the skin) down (got "${text}")`,
		);
	return Number(t);
}

/** `fundamental`, `tissue-harmonic` (or `harmonic`), `scatterer-harmonic`, or `both` (fundamental and tissue harmonic). */
export function parseReceive(text: string): ReceiveMode[] {
	switch (text.trim()) {
		case 'fundamental':
			return ['fundamental'];
		case 'harmonic':
		case 'tissue-harmonic':
			return ['tissue-harmonic'];
		case 'scatterer-harmonic':
			return ['scatterer-harmonic'];
		case 'both':
			return ['fundamental', 'tissue-harmonic'];
		default:
			throw new SweepError(
				'receive',
				`--receive: must be fundamental, tissue-harmonic (or harmonic), scatterer-harmonic or both (got "${text}")`,
			);
	}
}

/** One number in a range, e.g. the ladder margin. */
export function parseBoundedNumber(option: string, text: string, limit: Limit, unit: string): number {
	const v = parseDecimal(text);
	if (Number.isNaN(v) || v < limit.min || v > limit.max || (limit.exclusiveMin && v === limit.min)) {
		throw new SweepError(option, `--${option}: must be a number ${describeRange(limit, unit)} (got "${text}")`);
	}
	return v;
}

/**
 * Looks up layer `layer` (1-based) of a saved preset or template; returns undefined when the preset
 * does not exist and throws {@link SweepError} when it has no such layer.
 */
export type PresetLayerLookup = (preset: string, layer: number) => TissueChoice | undefined;

/** `4=spleen`, `4=liver,spleen`, `4=lower-abdomen:3` (layer 3 of that preset). */
export function parseSwap(text: string, presetLayer?: PresetLayerLookup): LayerSwap {
	const form =
		'expected N=TISSUE[,TISSUE…] where N is a layer number and TISSUE a tissue id or PRESET:M (layer M of a preset)';
	const eq = text.indexOf('=');
	if (eq < 0) throw new SweepError('swap', `--swap: "${text}" has no "="; ${form}`);
	const layerText = text.slice(0, eq).trim();
	if (!/^\d+$/.test(layerText)) throw new SweepError('swap', `--swap: "${layerText}" is not a layer number; ${form}`);
	const layer = Number(layerText);
	const items = text
		.slice(eq + 1)
		.split(',')
		.map((s) => s.trim());
	if (items.some((s) => s === '')) throw new SweepError('swap', `--swap: empty tissue in "${text}"; ${form}`);
	const choices = items.map((item): TissueChoice => {
		const colon = item.lastIndexOf(':');
		if (colon < 0) return {tissue: item};
		const preset = item.slice(0, colon).trim();
		const mText = item.slice(colon + 1).trim();
		if (preset === '' || !/^\d+$/.test(mText) || Number(mText) < 1) {
			throw new SweepError('swap', `--swap: "${item}" should be PRESET:M with M a layer number from 1; ${form}`);
		}
		if (!presetLayer)
			throw new SweepError('swap', `--swap: "${item}": presets are not available here; use a tissue id`);
		const found = presetLayer(preset, Number(mText));
		if (!found) throw new SweepError('swap', `--swap: no preset or template "${preset}" (see evenecho presets list)`);
		return found;
	});
	return {layer, choices};
}

/** The text options of `evenecho table`, as typed. */
export interface SweepText {
	readonly fat?: string;
	readonly layer?: string;
	readonly freq?: string;
	readonly angle?: string;
	readonly receive?: string;
	readonly swap?: readonly string[];
	readonly delta?: boolean;
	readonly margin?: string;
	readonly ladder?: string;
	readonly step?: string;
}

/** All options at once; values not given stay undefined (the sweep's defaults apply). */
export function parseSweepText(t: SweepText, presetLayer?: PresetLayerLookup): SweepSpec {
	return {
		...(t.fat !== undefined ? {fatCm: parseNumberList('fat', t.fat, limits.thicknessCm, 'cm')} : {}),
		...(t.layer !== undefined ? {layer: parseLayerNumber('layer', t.layer)} : {}),
		...(t.freq !== undefined ? {freqMhz: parseNumberList('freq', t.freq, limits.centerMhz, 'MHz')} : {}),
		...(t.angle !== undefined ? {angleDeg: parseNumberList('angle', t.angle, limits.angleDeg, '°')} : {}),
		...(t.receive !== undefined ? {receive: parseReceive(t.receive)} : {}),
		...(t.swap?.length ? {swaps: t.swap.map((s) => parseSwap(s, presetLayer))} : {}),
		...(t.delta ? {delta: true} : {}),
		...(t.margin !== undefined ? {marginDb: parseBoundedNumber('margin', t.margin, marginLimit, 'dB')} : {}),
		...(t.ladder !== undefined
			? {ladderMhz: parseNumberList('ladder', t.ladder, limits.centerMhz, 'MHz', maxLadderLength)}
			: {}),
		...(t.step !== undefined ? {stepCm: parseBoundedNumber('step', t.step, {min: 0.01, max: 5}, 'cm')} : {}),
	};
}
