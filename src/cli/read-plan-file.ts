/**
 * Reads a plan from a file or standard input ("-") and validates it. The file layer does the
 * reading (regular files only, 1 MB cap, UTF-8 with or without a byte-order mark, duplicate keys
 * refused); everything that can go wrong becomes a UsageError naming the file and the field.
 */
import type {EnginePlan} from '../engine/types.js';
import {maxPlanBytes} from '../files/bounded-read.js';
import {FileRefusedError} from '../files/file-errors.js';
import {readJsonInput} from '../files/json-input.js';
import {printable} from '../files/printable.js';
import {parsePlan} from '../plan/resolve-plan.js';
import type {PlanDocument} from '../plan/plan-schema.js';
import {UsageError} from '../errors/usage-error.js';

export {maxPlanBytes};

/** Any JSON input of the CLI: the file layer's refusals become UsageErrors (exit code 2). */
export async function readJsonInputOrRefuse(path: string, what = 'plan'): Promise<unknown> {
	try {
		return (await readJsonInput(path, {maxBytes: maxPlanBytes, what})).value;
	} catch (error) {
		if (error instanceof FileRefusedError) throw new UsageError(error.message);
		throw error;
	}
}

export async function readPlanFile(path: string): Promise<{doc: PlanDocument; plan: EnginePlan}> {
	const r = parsePlan(await readJsonInputOrRefuse(path, 'plan'));
	if (!r.ok) throw new UsageError(`${path === '-' ? 'standard input' : printable(path)}: not a valid plan`, r.errors);
	return r.value;
}
