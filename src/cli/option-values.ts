/**
 * Numbers from command-line options, parsed with the table code's own rules so that every command
 * accepts the same spellings and words its refusals the same way; refusals become UsageErrors.
 */
import type {Limit} from '../plan/plan-schema.js';
import {SweepError} from '../table/sweep-spec.js';
import {parseBoundedNumber, parseNumberList} from '../table/sweep-options.js';
import {UsageError} from '../errors/usage-error.js';

function asUsage<T>(parse: () => T): T {
	try {
		return parse();
	} catch (error) {
		if (error instanceof SweepError) throw new UsageError(error.message);
		throw error;
	}
}

/** One number within `limit`; `option` without the leading dashes. */
export function numberOption(option: string, text: string, limit: Limit, unit: string): number {
	return asUsage(() => parseBoundedNumber(option, text, limit, unit));
}

/** "2,3.5,5" or from:to:step, each value within `limit`. */
export function numberListOption(
	option: string,
	text: string,
	limit: Limit,
	unit: string,
	maxLength: number,
): number[] {
	return asUsage(() => parseNumberList(option, text, limit, unit, maxLength));
}
