/**
 * The tissue picker's filter: the library rows whose name or id hold every typed word, in library
 * order. Pure.
 */
import type {Tissue} from '../../engine/types.js';
import {pickerTissues} from './state-helpers.js';

/** Longest filter text kept. */
export const tissueFilterMax = 30;

export function filteredTissues(filter: string): readonly Tissue[] {
	const words = filter.toLowerCase().split(/\s+/).filter(Boolean);
	if (words.length === 0) return pickerTissues;
	return pickerTissues.filter((t) => {
		const text = `${t.label} ${t.id ?? ''}`.toLowerCase();
		return words.every((w) => text.includes(w));
	});
}
