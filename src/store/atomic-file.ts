/**
 * Whole-file writes that a crash cannot leave half done: the text goes to a temporary file in the
 * same directory, is flushed to disk, and only then takes the final name (rename replaces, link
 * creates exclusively). Readers therefore see the old file or the new one, never a mixture.
 */
import {randomBytes} from 'node:crypto';
import {closeSync, fsyncSync, linkSync, openSync, renameSync, unlinkSync, writeSync, existsSync} from 'node:fs';
import {basename, dirname, join} from 'node:path';

/** Temporary files start with a dot and end like this; the store skips and later sweeps them. */
export const tempSuffix = '.tmp';

/** True for the store's own temporary files (never read as presets). */
export function isTempName(fileName: string): boolean {
	return fileName.startsWith('.') && fileName.endsWith(tempSuffix);
}

/** Writes `text` to a fresh temporary file beside `target`, flushed; returns its path. */
export function writeTemp(target: string, text: string): string {
	const temp = join(dirname(target), `.${basename(target)}.${process.pid}.${randomBytes(4).toString('hex')}${tempSuffix}`);
	const fd = openSync(temp, 'wx', 0o644);
	try {
		const data = Buffer.from(text, 'utf8');
		let off = 0;
		while (off < data.length) off += writeSync(fd, data, off, data.length - off);
		fsyncSync(fd);
	} catch (error) {
		closeSync(fd);
		removeQuietly(temp);
		throw error;
	}
	closeSync(fd);
	return temp;
}

/** Gives a temporary file its final name, replacing whatever was there. */
export function commitReplace(temp: string, target: string): void {
	try {
		renameSync(temp, target);
	} catch (error) {
		removeQuietly(temp);
		throw error;
	}
	syncDirectory(dirname(target));
}

/**
 * Gives a temporary file its final name only if that name is free, atomically: a hard link fails
 * with EEXIST when another process got there first. Returns false (and removes the temporary file)
 * when the name was taken.
 */
export function commitExclusive(temp: string, target: string): boolean {
	try {
		linkSync(temp, target);
	} catch (error) {
		const code = (error as NodeJS.ErrnoException).code;
		if (code === 'EEXIST') {
			removeQuietly(temp);
			return false;
		}
		if (code === 'EPERM' || code === 'ENOTSUP' || code === 'ENOSYS' || code === 'EOPNOTSUPP') {
			// File systems without hard links (some network shares): check, then rename. The window
			// between the two is tiny but not zero; on Linux local disks the link path is taken.
			if (existsSync(target)) {
				removeQuietly(temp);
				return false;
			}
			commitReplace(temp, target);
			return true;
		}
		removeQuietly(temp);
		throw error;
	}
	removeQuietly(temp);
	syncDirectory(dirname(target));
	return true;
}

/** `writeTemp` + `commitReplace`. */
export function writeFileAtomic(target: string, text: string): void {
	commitReplace(writeTemp(target, text), target);
}

/** `writeTemp` + `commitExclusive`: false when `target` already exists (nothing written). */
export function createFileAtomic(target: string, text: string): boolean {
	return commitExclusive(writeTemp(target, text), target);
}

/** Deletes a file if it is there; never throws. */
export function removeQuietly(path: string): void {
	try {
		unlinkSync(path);
	} catch {
		// Already gone, or never created: nothing to clean up.
	}
}

/** Makes the rename itself durable; some platforms cannot open directories, which is fine. */
function syncDirectory(dir: string): void {
	let fd: number | undefined;
	try {
		fd = openSync(dir, 'r');
		fsyncSync(fd);
	} catch {
		// Best effort only.
	} finally {
		if (fd !== undefined) closeSync(fd);
	}
}
