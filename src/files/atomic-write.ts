/**
 * The one way evenecho writes a file (exports, the console's exports, preset records, the store's
 * settings, later images): whole or not at all, and only where it was asked to write.
 *
 * - The data goes first to a temporary file beside the target, with an unpredictable name, created
 *   exclusively (O_CREAT|O_EXCL|O_NOFOLLOW): a file or link planted in advance under that name makes
 *   the open fail instead of redirecting the write. The data is flushed (fsync) before it is named.
 * - Then the temporary file takes the target's name: rename() when replacing is allowed (it replaces
 *   the directory entry and never follows a link there), link() when it is not (fails if the name
 *   is taken, atomically, so two writers cannot both "create" it). The folder is flushed after.
 * - Only a regular file is ever replaced: a link, device, FIFO or folder at the target is refused
 *   and left alone. A replaced file keeps its permission bits.
 */
import {randomBytes} from 'node:crypto';
import {
	closeSync,
	constants,
	fchmodSync,
	fsyncSync,
	linkSync,
	lstatSync,
	openSync,
	renameSync,
	unlinkSync,
	writeSync,
	type Stats,
} from 'node:fs';
import {basename, dirname, join} from 'node:path';
import {FileRefusedError, errnoOf} from './file-errors.js';
import {describeKind} from './file-kind.js';
import {printable} from './printable.js';

/** Temporary files start with a dot and end like this; folder scans skip and later sweep them. */
export const tempSuffix = '.tmp';

/** True for a temporary file name this module makes (never read as a record). */
export function isTempName(fileName: string): boolean {
	return fileName.startsWith('.') && fileName.endsWith(tempSuffix);
}

/** A fresh unpredictable temporary name beside `target` (96 random bits). */
export function tempPathFor(target: string, tag = ''): string {
	// Cut long names so the temporary name stays within the usual 255-byte limit.
	const base = basename(target).slice(0, 100);
	return join(dirname(target), `.${base}${tag ? `.${tag}` : ''}.${randomBytes(12).toString('hex')}${tempSuffix}`);
}

const noFollow = constants.O_NOFOLLOW ?? 0;

export interface WriteOptions {
	/** Allow replacing an existing regular file at the target. Without it an existing target is refused. */
	readonly replace: boolean;
	/** Keep the temporary name as a second link after an exclusive commit (the batch writer's proof). */
	readonly keepTemp?: boolean;
}

/** A flushed temporary file waiting to take its target's name. */
export interface StagedFile {
	readonly temp: string;
	readonly target: string;
}

/** The entry at `path` without following a link, or undefined when there is none. */
export function entryAt(path: string): Stats | undefined {
	try {
		return lstatSync(path);
	} catch (error) {
		if (errnoOf(error) === 'ENOENT') return undefined;
		throw error;
	}
}

export function refuseNonRegular(target: string, stat: Stats): never {
	const code = stat.isSymbolicLink() ? 'symbolic-link' : 'not-regular';
	throw new FileRefusedError(
		code,
		`${printable(target)}: is ${describeKind(stat)}, not a regular file; refusing to replace it (nothing was written)`,
	);
}

function unwritable(target: string, error: unknown): FileRefusedError {
	const errno = errnoOf(error);
	const why =
		errno === 'ENOSPC'
			? 'the disk is full'
			: errno === 'EACCES' || errno === 'EPERM'
				? 'permission denied'
				: errno === 'EROFS'
					? 'read-only file system'
					: (errno ?? (error as Error).message);
	return new FileRefusedError('unwritable', `cannot write ${printable(target)} (${why}); nothing was written`, errno);
}

/**
 * Writes `data` to a new temporary file beside `target` and flushes it. The temporary file takes
 * the permission bits of the regular file it will replace (if any).
 */
export function stageFile(
	target: string,
	data: string | Uint8Array,
	options: {tag?: string; temp?: string} = {},
): StagedFile {
	const existing = entryAt(target);
	if (existing && !existing.isFile()) refuseNonRegular(target, existing);
	const temp = options.temp ?? tempPathFor(target, options.tag);
	let fd: number;
	try {
		fd = openSync(temp, constants.O_WRONLY | constants.O_CREAT | constants.O_EXCL | noFollow, 0o666);
	} catch (error) {
		throw unwritable(target, error);
	}
	try {
		if (existing) fchmodSync(fd, existing.mode & 0o7777);
		const bytes = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
		let offset = 0;
		while (offset < bytes.length) offset += writeSync(fd, bytes, offset, bytes.length - offset);
		fsyncSync(fd);
	} catch (error) {
		closeSync(fd);
		removeQuietly(temp);
		throw unwritable(target, error);
	}
	closeSync(fd);
	return {temp, target};
}

/**
 * Gives a staged file its target's name.
 * @throws FileRefusedError `exists` when replacing is not allowed and the name is taken (by
 *   anything, even a dangling link); `not-regular`/`symbolic-link` when the target is not a
 *   regular file. The temporary file is removed whatever happens.
 */
export function commitStaged(staged: StagedFile, options: WriteOptions): void {
	const {temp, target} = staged;
	try {
		if (options.replace) {
			const existing = entryAt(target);
			if (existing && !existing.isFile()) refuseNonRegular(target, existing);
			renameSync(temp, target);
		} else {
			linkExclusive(temp, target);
			if (!options.keepTemp) removeQuietly(temp);
		}
	} catch (error) {
		removeQuietly(temp);
		if (error instanceof FileRefusedError) throw error;
		throw unwritable(target, error);
	}
	syncFolder(dirname(target));
}

/** link(), with a careful fallback for file systems that have no hard links. */
function linkExclusive(temp: string, target: string): void {
	try {
		linkSync(temp, target);
	} catch (error) {
		const errno = errnoOf(error);
		if (errno === 'EEXIST') throw existsError(target);
		if (errno === 'EPERM' || errno === 'ENOTSUP' || errno === 'ENOSYS' || errno === 'EOPNOTSUPP') {
			// No hard links here (some network shares): check, then rename. The window between the
			// two is tiny but not zero; Linux and macOS local disks take the link path.
			if (entryAt(target)) throw existsError(target);
			renameSync(temp, target);
			return;
		}
		throw error;
	}
}

function existsError(target: string): FileRefusedError {
	return new FileRefusedError('exists', `${printable(target)} already exists; nothing was written`, 'EEXIST');
}

/** Removes a staged file that will not be committed. */
export function discardStaged(staged: StagedFile): void {
	removeQuietly(staged.temp);
}

/** Stage + commit: the whole atomic write. */
export function writeFileAtomic(target: string, data: string | Uint8Array, options: WriteOptions): void {
	commitStaged(stageFile(target, data), options);
}

/** Deletes a file if it is there; never throws. */
export function removeQuietly(path: string): void {
	try {
		unlinkSync(path);
	} catch {
		// Already gone, or never created: nothing to clean up.
	}
}

/** Makes renames and links in `dir` durable; some platforms cannot open folders, which is fine. */
export function syncFolder(dir: string): void {
	let fd: number | undefined;
	try {
		fd = openSync(dir, constants.O_RDONLY | (constants.O_DIRECTORY ?? 0));
		fsyncSync(fd);
	} catch {
		// Best effort only.
	} finally {
		if (fd !== undefined) closeSync(fd);
	}
}
