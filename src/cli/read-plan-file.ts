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
import {parsePlan, resolvePlan, type PlanScanner} from '../plan/resolve-plan.js';
import type {PlanDocument} from '../plan/plan-schema.js';
import {UsageError} from '../errors/usage-error.js';

export {maxPlanBytes};

/** Any JSON input of the CLI: the file layer's refusals become UsageErrors (exit code 2). */
export async function readJsonInputOrRefuse(path: string, what = 'plan'): Promise<unknown> {
	try {
		// Only the value is used: no fingerprint of the file (that is for the store's guarded changes).
		return (await readJsonInput(path, {maxBytes: maxPlanBytes, what, withIdentity: false})).value;
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

/**
 * The measured scanner a plan names (its "scanner" field), from the profile store; undefined when
 * it names none. The store is loaded only then, so plans without it start as fast as before.
 */
export async function scannerForPlan(doc: PlanDocument): Promise<PlanScanner | undefined> {
	if (doc.scanner === undefined) return undefined;
	const {openScannerProfileStore} = await import('../store/scanner-profile-store.js');
	const {scannerResponseOf} = await import('../calibration/profile-document.js');
	try {
		return scannerResponseOf(openScannerProfileStore().get(doc.scanner));
	} catch (error) {
		if (error instanceof UsageError) throw new UsageError(`scanner: ${error.message}`);
		throw error;
	}
}

/** readPlanFile, with the scanner profile the plan names (if any) in its engine plan. */
export async function readMeasuredPlanFile(path: string): Promise<{doc: PlanDocument; plan: EnginePlan}> {
	const read = await readPlanFile(path);
	const scanner = await scannerForPlan(read.doc);
	return scanner ? {doc: read.doc, plan: resolvePlan(read.doc, scanner)} : read;
}
