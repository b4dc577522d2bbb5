/** Parses option values such as "2,2.5,3.5" or "2:10:0.5" (from:to:step) into checked numbers. */
import {UsageError} from './usage-error.js';

export interface ListRule {
	readonly option: string;
	readonly min: number;
	readonly max: number;
	readonly unit: string;
	readonly exclusiveMin?: boolean;
	/** Most values allowed in one list. */
	readonly maxCount?: number;
}

function describe(rule: ListRule): string {
	return `${rule.exclusiveMin ? `above ${rule.min}` : `from ${rule.min}`} ${rule.exclusiveMin ? 'and up to' : 'to'} ${rule.max} ${rule.unit}`.trim();
}

export function parseNumberList(text: string, rule: ListRule): number[] {
	const bad = (why: string) => new UsageError(`${rule.option}: ${why}; give numbers ${describe(rule)}, e.g. "2,3.5,5" or "2:8:0.5"`);
	const trimmed = text.trim();
	if (!trimmed) throw bad('the list is empty');
	let values: number[];
	const range = /^([^:]+):([^:]+):([^:]+)$/.exec(trimmed);
	if (range) {
		const [from, to, step] = range.slice(1).map(Number) as [number, number, number];
		if (![from, to, step].every(Number.isFinite) || step <= 0 || to < from) throw bad(`"${trimmed}" is not a from:to:step range with step > 0`);
		const count = Math.floor((to - from) / step + 1e-9) + 1;
		if (count > (rule.maxCount ?? 1000)) throw bad(`"${trimmed}" makes ${count} values, more than ${rule.maxCount ?? 1000}`);
		values = Array.from({length: count}, (_, i) => Number((from + i * step).toFixed(6)));
	} else {
		values = trimmed.split(',').map((part) => {
			const v = Number(part.trim());
			if (part.trim() === '' || !Number.isFinite(v)) throw bad(`"${part.trim()}" is not a number`);
			return v;
		});
	}
	for (const v of values) {
		const low = rule.exclusiveMin ? v <= rule.min : v < rule.min;
		if (low || v > rule.max) throw bad(`${v} is out of range`);
	}
	if (values.length > (rule.maxCount ?? 1000)) throw bad(`${values.length} values, more than ${rule.maxCount ?? 1000}`);
	return values;
}
