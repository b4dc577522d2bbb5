/**
 * Writes a set of files into one folder so that a failure leaves nothing half-written: every file
 * is first written in full to a hidden temporary beside its target, and only when all are there do
 * they take their names; without `replace`, names are taken exclusively, and if one turns out to be
 * taken meanwhile the files this call already placed are removed again.
 */
import {commitTemp, removeQuietly, writeTempBytes} from './atomic-bytes.js';

export interface OutputFile {
	readonly path: string;
	readonly bytes: Uint8Array;
}

/** Thrown when a target already exists and `replace` is off; nothing of this set stays written. */
export class FileExistsError extends Error {
	constructor(readonly path: string) {
		super(`${path} already exists`);
		this.name = 'FileExistsError';
	}
}

export function writeFileSet(files: readonly OutputFile[], replace: boolean): void {
	const temps: string[] = [];
	try {
		for (const f of files) temps.push(writeTempBytes(f.path, f.bytes));
	} catch (error) {
		for (const t of temps) removeQuietly(t);
		throw error;
	}
	const placed: string[] = [];
	for (let i = 0; i < files.length; i++) {
		const target = files[i]!.path;
		let ok: boolean;
		try {
			ok = commitTemp(temps[i]!, target, replace);
		} catch (error) {
			for (const t of temps.slice(i + 1)) removeQuietly(t);
			if (!replace) for (const p of placed) removeQuietly(p);
			throw error;
		}
		if (!ok) {
			for (const t of temps.slice(i + 1)) removeQuietly(t);
			for (const p of placed) removeQuietly(p);
			throw new FileExistsError(target);
		}
		placed.push(target);
	}
}
