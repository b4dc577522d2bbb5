/**
 * Number fields of the console, pure: parse what was typed, nudge by a step, and refuse anything
 * outside the plan format's ranges with a message that names the range. Nothing here throws.
 */
import {describeRange, type Limit} from '../../plan/plan-schema.js';
import {roundTo} from '../../plan/rounding.js';

export interface NumberSpec {
	readonly label: string;
	/** Shown after the value and in range messages (`MHz`, `cm`); '' for none. */
	readonly unit: string;
	readonly limit: Limit;
	/** Fine nudge (+/-). */
	readonly step: number;
	/** Coarse nudge (]/[). */
	readonly coarse: number;
	/** Decimals kept when nudging and shown at most. */
	readonly decimals: number;
	readonly integer?: boolean;
	/** Always show every decimal (columns of dB line up). */
	readonly isFixed?: boolean;
}

export type Checked = {readonly ok: true; readonly value: number} | {readonly ok: false; readonly message: string};

/** "must be a number from 1 to 16" in the plan format's own words. */
export function rangeMessage(spec: NumberSpec): string {
	return `must be ${spec.integer ? 'a whole number' : 'a number'} ${describeRange(spec.limit, spec.unit)}`;
}

export function isInRange(value: number, spec: NumberSpec): boolean {
	const {min, max, exclusiveMin} = spec.limit;
	if (!Number.isFinite(value) || value > max) return false;
	if (spec.integer && !Number.isInteger(value)) return false;
	return exclusiveMin ? value > min : value >= min;
}

/** Typed text: digits, one point (a comma is read as a point), an optional leading minus. */
export function parseEntry(text: string, spec: NumberSpec): Checked {
	const t = text.trim().replace(',', '.');
	if (t === '') return {ok: false, message: `type a value: ${rangeMessage(spec)}`};
	if (!/^[-+]?(\d+\.?\d*|\.\d+)$/.test(t))
		return {ok: false, message: `"${text.trim()}" is not a number: ${rangeMessage(spec)}`};
	const value = Number(t);
	if (!isInRange(value, spec)) return {ok: false, message: rangeMessage(spec)};
	return {ok: true, value};
}

/** One step up or down; refused (value unchanged) when it would leave the range. */
export function nudge(value: number, spec: NumberSpec, direction: 1 | -1, isCoarse = false): Checked {
	// Keep the value's own precision: 0.0014 + 0.05 is 0.0514, not 0.051.
	const places = spec.integer ? 0 : Math.max(spec.decimals, decimalsOf(value));
	const next = roundTo(value + direction * (isCoarse ? spec.coarse : spec.step), places);
	if (!isInRange(next, spec)) return {ok: false, message: `${formatNumber(next, spec)} refused: ${rangeMessage(spec)}`};
	return {ok: true, value: next};
}

/** Decimal places a value really has (binary noise ignored), at most 6. */
export function decimalsOf(value: number): number {
	if (!Number.isFinite(value)) return 0;
	const text = String(Number(value.toPrecision(12)));
	const dot = text.indexOf('.');
	return dot < 0 || text.includes('e') ? 0 : Math.min(6, text.length - dot - 1);
}

/**
 * `decimals` places, trailing zeros dropped (3.5, 16, 0.55); more when the value has more, so what
 * is shown reads back as the stored value (a custom α0 of 0.0014 shows 0.0014, not 0.001).
 */
export function formatNumber(value: number, spec: Pick<NumberSpec, 'decimals' | 'isFixed'>): string {
	if (!Number.isFinite(value)) return String(value);
	const s = value.toFixed(spec.isFixed ? spec.decimals : Math.max(spec.decimals, decimalsOf(value)));
	return spec.isFixed || !s.includes('.') ? s : s.replace(/\.?0+$/, '');
}

/** Characters that may appear while typing a number. */
export function isNumberChar(ch: string): boolean {
	return /^[0-9.,+-]$/.test(ch);
}
