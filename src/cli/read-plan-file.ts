/**
 * Reads a plan from a file or standard input ("-") and validates it. Everything that can go wrong
 * becomes a UsageError naming the file and the field.
 */
import {readFileSync, statSync} from 'node:fs';
import type {EnginePlan} from '../engine/types.js';
import {parsePlan} from '../plan/resolve-plan.js';
import type {PlanDocument} from '../plan/plan-schema.js';
import {UsageError} from '../errors/usage-error.js';

/** Plans are small; anything bigger is not a plan. */
export const maxPlanBytes = 1_000_000;

export function readJsonFile(path: string, what = 'file'): unknown {
	let text: string;
	try {
		if (path === '-') {
			text = readFileSync(0, 'utf8');
		} else {
			const size = statSync(path).size;
			if (size > maxPlanBytes) throw new UsageError(`${path}: ${what} is ${size} bytes; the limit is ${maxPlanBytes}`);
			text = readFileSync(path, 'utf8');
		}
	} catch (error) {
		if (error instanceof UsageError) throw error;
		const code = (error as NodeJS.ErrnoException).code;
		throw new UsageError(`${path === '-' ? 'standard input' : path}: cannot read ${what}${code ? ` (${code})` : ''}`);
	}
	if (text.length > maxPlanBytes) throw new UsageError(`${path}: ${what} is larger than ${maxPlanBytes} bytes`);
	try {
		return JSON.parse(text) as unknown;
	} catch (error) {
		throw new UsageError(`${path === '-' ? 'standard input' : path}: not valid JSON (${(error as Error).message})`);
	}
}

export function readPlanFile(path: string): {doc: PlanDocument; plan: EnginePlan} {
	const r = parsePlan(readJsonFile(path, 'plan'));
	if (!r.ok) throw new UsageError(`${path === '-' ? 'standard input' : path}: not a valid plan`, r.errors);
	return r.value;
}
