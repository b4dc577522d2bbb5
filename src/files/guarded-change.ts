/**
 * Compare-and-swap for replacing or deleting a file that was read earlier: the change happens only
 * if the file is still the one that was read (same inode, same SHA-256 of its bytes), so a save
 * landing between our read and our change is never lost.
 *
 * How: the current file is first moved aside, atomically, to a private temporary name (a rename
 * takes exactly what is there at that instant); the moved file is then compared with what was
 * read. If it differs, it is put back (link, so a file written meanwhile under the name wins) and
 * the change is refused. A crash in between leaves the aside file, which `sweepTemps` puts back.
 */
import {createHash} from 'node:crypto';
import {linkSync, lstatSync, readFileSync, renameSync} from 'node:fs';
import {dirname} from 'node:path';
import type {FileIdentity} from './bounded-read.js';
import {commitStaged, discardStaged, removeQuietly, stageFile, syncFolder, tempPathFor} from './atomic-write.js';
import {FileRefusedError, errnoOf} from './file-errors.js';
import {printable} from './printable.js';

/** Marks an aside file: restored to its name by the sweep if a crash left it behind. */
export const heldTag = 'held';

/** Test-only pause points: called between the steps, so a test can land a rival write there. */
export type PausePoint = (point: 'before-take' | 'after-take') => void;

export type GuardedOutcome = 'done' | 'changed' | 'gone';

function sameFile(held: string, expected: FileIdentity): boolean {
	try {
		const stat = lstatSync(held);
		if (!stat.isFile() || stat.ino !== expected.ino || stat.dev !== expected.dev) return false;
		return createHash('sha256').update(readFileSync(held)).digest('hex') === expected.sha256;
	} catch {
		return false;
	}
}

/** Moves the file aside; undefined when nothing is there any more. */
function take(path: string): string | undefined {
	const held = tempPathFor(path, heldTag);
	try {
		renameSync(path, held);
		return held;
	} catch (error) {
		if (errnoOf(error) === 'ENOENT') return undefined;
		throw new FileRefusedError(
			'unwritable',
			`cannot change ${printable(path)} (${errnoOf(error) ?? 'error'}); nothing was changed`,
			errnoOf(error),
		);
	}
}

/** Puts an aside file back under its name unless another file has taken the name meanwhile. */
export function putBack(held: string, path: string): void {
	try {
		linkSync(held, path);
	} catch {
		// The name is taken by a newer file, which wins; the held one was older.
	}
	removeQuietly(held);
	syncFolder(dirname(path));
}

/**
 * Deletes `path` if it is still the file read as `expected`.
 * @returns `done`; `changed` (it was replaced since it was read: left in place); `gone` (nothing there).
 */
export function removeIfUnchanged(path: string, expected: FileIdentity, pause?: PausePoint): GuardedOutcome {
	pause?.('before-take');
	const held = take(path);
	if (!held) return 'gone';
	pause?.('after-take');
	if (!sameFile(held, expected)) {
		putBack(held, path);
		return 'changed';
	}
	removeQuietly(held);
	syncFolder(dirname(path));
	return 'done';
}

/**
 * Replaces `path` with `data` if it is still the file read as `expected`; the new file keeps the
 * old one's permission bits.
 * @returns `done`, `changed` (left as it is) or `gone` (nothing written: it was deleted meanwhile).
 */
export function replaceIfUnchanged(
	path: string,
	data: string | Uint8Array,
	expected: FileIdentity,
	pause?: PausePoint,
): GuardedOutcome {
	const staged = stageFile(path, data);
	pause?.('before-take');
	let held: string | undefined;
	try {
		held = take(path);
	} catch (error) {
		discardStaged(staged);
		throw error;
	}
	if (!held) {
		discardStaged(staged);
		return 'gone';
	}
	pause?.('after-take');
	if (!sameFile(held, expected)) {
		discardStaged(staged);
		putBack(held, path);
		return 'changed';
	}
	try {
		// Exclusive: a save that created the name after our take wins, and ours is refused.
		commitStaged(staged, {replace: false});
	} catch (error) {
		removeQuietly(held);
		if (error instanceof FileRefusedError && error.code === 'exists') return 'changed';
		putBack(held, path);
		throw error;
	}
	removeQuietly(held);
	return 'done';
}

/**
 * Moves `path` to `backup` (a damaged file kept for the user) if it is still the file read as
 * `expected`; a good file written meanwhile stays where it is.
 */
export function moveAsideIfUnchanged(path: string, backup: string, expected: FileIdentity): GuardedOutcome {
	const held = take(path);
	if (!held) return 'gone';
	if (!sameFile(held, expected)) {
		putBack(held, path);
		return 'changed';
	}
	try {
		linkSync(held, backup);
	} catch {
		putBack(held, path);
		return 'changed';
	}
	removeQuietly(held);
	syncFolder(dirname(path));
	return 'done';
}
