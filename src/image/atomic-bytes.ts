/**
 * Whole-file binary writes a crash cannot leave half done: the bytes go to a temporary file beside
 * the target, are flushed, then take the final name — replacing (`force`) or only if the name is
 * free. TODO: swap for the shared atomic writer in src/files/ once it lands on main; until then this
 * mirrors src/store/atomic-file.ts for bytes.
 */
import {randomBytes} from 'node:crypto';
import {closeSync, fsyncSync, linkSync, openSync, renameSync, unlinkSync, writeSync} from 'node:fs';
import {basename, dirname, join} from 'node:path';

/** Writes to a fresh hidden temporary file beside `target`; returns its path. */
export function writeTempBytes(target: string, bytes: Uint8Array): string {
	const temp = join(dirname(target), `.${basename(target)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
	const fd = openSync(temp, 'wx', 0o644);
	try {
		let off = 0;
		while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off);
		fsyncSync(fd);
	} catch (error) {
		closeSync(fd);
		removeQuietly(temp);
		throw error;
	}
	closeSync(fd);
	return temp;
}

/** Gives the temporary file its final name; false (temporary removed) when the name is taken and
 * `replace` is off. A hard link fails with EEXIST atomically when another file got there first. */
export function commitTemp(temp: string, target: string, replace: boolean): boolean {
	try {
		if (replace) renameSync(temp, target);
		else {
			linkSync(temp, target);
			removeQuietly(temp);
		}
		return true;
	} catch (error) {
		removeQuietly(temp);
		if ((error as NodeJS.ErrnoException).code === 'EEXIST') return false;
		throw error;
	}
}

/** One file, atomically; false when it exists and `replace` is off (nothing written). */
export function writeBytesAtomic(target: string, bytes: Uint8Array, replace: boolean): boolean {
	return commitTemp(writeTempBytes(target, bytes), target, replace);
}

export function removeQuietly(path: string): void {
	try {
		unlinkSync(path);
	} catch {
		// Already gone: nothing to clean up.
	}
}
