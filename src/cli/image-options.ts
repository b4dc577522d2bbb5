/** Options shared by the picture commands: sizes, seed, output files and folders. */
import {existsSync, mkdirSync, rmdirSync, statSync} from 'node:fs';
import {join} from 'node:path';
import {writeFileAtomic} from '../files/atomic-write.js';
import {commitBatch, type BatchEntry} from '../files/file-batch.js';
import {FileRefusedError} from '../files/file-errors.js';
import {numberOption} from './option-values.js';
import {UsageError} from '../errors/usage-error.js';

/** Picture sizes, px: big enough to show speckle, small enough to stay a picture and not a memory test. */
export const pixelLimit = {min: 8, max: 4096} as const;
export const seedLimit = {min: 0, max: 4294967295} as const;
export const dynamicRangeLimit = {min: 10, max: 120} as const;

export function wholeNumberOption(
	option: string,
	text: string,
	limit: {min: number; max: number},
	unit: string,
): number {
	const v = numberOption(option, text, limit, unit);
	if (!Number.isInteger(v))
		throw new UsageError(
			`--${option}: must be a whole number from ${limit.min} to ${limit.max}${unit ? ` ${unit}` : ''} (got "${text}")`,
		);
	return v;
}

/** The folder named by `--out`: made if missing (its parent must exist), refused if not a folder.
 * True when this call made it. */
export function outputFolder(dir: string): boolean {
	if (existsSync(dir)) {
		if (!statSync(dir).isDirectory()) throw new UsageError(`--out: ${dir} exists and is not a folder`);
		return false;
	}
	try {
		mkdirSync(dir);
		return true;
	} catch (error) {
		throw new UsageError(
			`--out: cannot create the folder ${dir} (${(error as NodeJS.ErrnoException).code ?? 'error'})`,
		);
	}
}

/** One file written atomically; refusals name `option`. */
export function writeOutputFile(option: string, path: string, bytes: Uint8Array, force: boolean): void {
	try {
		writeFileAtomic(path, bytes, {replace: force});
	} catch (error) {
		if (error instanceof FileRefusedError)
			throw new UsageError(
				`--${option}: ${error.message}${error.code === 'exists' ? ' (add --force to replace it)' : ''}`,
			);
		throw error;
	}
}

/** Files written into one folder as one change (all or none); refusals name `option`. */
export function writeOutputBatch(option: string, dir: string, files: readonly BatchEntry[], force: boolean): void {
	if (!force) {
		const taken = files.filter((f) => existsSync(join(dir, f.name))).map((f) => f.name);
		if (taken.length > 0)
			throw new UsageError(
				`--${option}: ${taken.join(', ')} already exist${taken.length === 1 ? 's' : ''} in ${dir}; nothing written (add --force to replace)`,
			);
	}
	try {
		commitBatch(dir, files, {replace: force});
	} catch (error) {
		if (error instanceof FileRefusedError)
			throw new UsageError(
				`--${option}: ${error.message}${error.code === 'exists' ? ' (add --force to replace)' : ''}`,
			);
		throw error;
	}
}

/** Removes a folder this run made, if it is still empty; never throws. */
export function removeEmptyFolder(dir: string): void {
	try {
		rmdirSync(dir);
	} catch {
		// Not empty or already gone: leave it.
	}
}
