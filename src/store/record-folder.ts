/**
 * A folder of records in the user's store, one JSON file each, named by the record's slug: the
 * machinery the preset store and the scanner-profile store share, so both keep the same promises.
 *
 * Why one file per record, and what that buys:
 * - Every file is read and written through src/files: regular files only, never through a link,
 *   capped reads, strict JSON, the one atomic writer. The store's folders must be real folders of
 *   the user's own.
 * - A record is written to a temporary file, flushed, and then renamed (replace) or hard-linked
 *   (create only if absent) into place. Two processes saving different records never touch the
 *   same file, so neither can lose the other's update; two saving the same name race on the
 *   exclusive link and exactly one wins. No lock file is needed, so no lock can go stale after a
 *   crash, and a crash mid-write leaves at most a stray temporary file (skipped, and swept after an
 *   hour), never a half-written record. One shared JSON file would need a lock around every
 *   read-modify-write.
 * - Deleting or replacing a record checks that the file is still the one read (inode and SHA-256,
 *   guarded-change.ts), so a save landing in between is kept. Writing several records (an import)
 *   is one journalled batch (file-batch.ts): a crash half way is rolled back when the folder is next
 *   opened.
 * - Damage is contained to one file. A file that is not JSON at all is moved aside to
 *   `<file>.damaged-<time>` and a notice says so; one that is JSON but no longer validates is left
 *   untouched and reported by the store that owns it (its `decode` says what is wrong).
 */
import {readdirSync} from 'node:fs';
import {join} from 'node:path';
import {entryAt, isTempName, writeFileAtomic} from '../files/atomic-write.js';
import {maxPlanBytes, readRegularFile, type FileIdentity} from '../files/bounded-read.js';
import {commitBatch, recoverBatches, type BatchPause} from '../files/file-batch.js';
import {FileRefusedError, errnoOf} from '../files/file-errors.js';
import {
	moveAsideIfUnchanged,
	removeIfUnchanged,
	replaceIfUnchanged,
	type GuardedOutcome,
	type PausePoint,
} from '../files/guarded-change.js';
import {parseJsonBytes} from '../files/json-input.js';
import {checkOwnedFolder} from '../files/owned-folder.js';
import {printable} from '../files/printable.js';
import {slug} from '../files/slug.js';
import {sweepTemps} from '../files/temp-sweep.js';

/** Test-only pause points: a guarded delete or replace, and each file of a batch. */
export interface StorePause {
	readonly guarded?: PausePoint;
	readonly batch?: BatchPause;
}

/** What kind of record a folder holds, and how its files are read. */
export interface RecordKind<D> {
	/** The store in messages, e.g. `the preset store`. */
	readonly store: string;
	/** The record in messages, e.g. `user preset`. */
	readonly noun: string;
	/** The records in messages, e.g. `presets`. */
	readonly plural: string;
	/** How one record is named in messages, from its file's stem (e.g. `user:liver-deep`). */
	label(stem: string): string;
	/** Reads a parsed file; never throws (a record that does not validate is decoded as such). */
	decode(value: unknown): D;
	/** The record of a file that is JSON but that the strict reader refuses (prototype keys, depth). */
	refused(problem: string): D;
	/** The store's own error (the CLI prints it with exit code 2). */
	fail(message: string): Error;
}

/** One record file as read: the decoded record, and who the file was (for guarded changes). */
export interface RecordEntry<D> {
	/** The file name without `.json`: the record's slug. */
	readonly stem: string;
	readonly file: string;
	readonly record: D;
	readonly identity: FileIdentity;
}

export interface RecordFolderOptions<D> {
	/** The store's folder, which holds this one. */
	readonly home: string;
	/** This folder's name inside `home`. */
	readonly name: string;
	readonly kind: RecordKind<D>;
	/** Make `home` when it is missing (the store opened for the first time). @default false */
	readonly createHome?: boolean;
	/** Notices go here (the owning store's list), e.g. a damaged file moved aside. */
	readonly notices: string[];
	readonly pause?: StorePause;
}

function timestamp(): string {
	return `${new Date().toISOString().replace(/[:.]/g, '-')}-${process.pid}`;
}

/**
 * Moves a damaged file aside, byte for byte, to `<file>.damaged-<time>` (which no store reads), only
 * if it is still the file that was read: a good file another process wrote meanwhile stays.
 * Returns the backup path, or undefined when nothing was moved.
 */
export function keepDamaged(file: string, seen: FileIdentity): string | undefined {
	const backup = `${file}.damaged-${timestamp()}`;
	return moveAsideIfUnchanged(file, backup, seen) === 'done' ? backup : undefined;
}

/** The refusal's message without the file layer's own ending, so the caller can say what did not happen. */
function withoutEnding(error: FileRefusedError): string {
	return error.message.replace(/; nothing was written$/, '');
}

/** The files of one kind of record, one each; see the module comment for the guarantees. */
export class RecordFolder<D> {
	readonly home: string;
	readonly folder: string;
	/** Set when the folder cannot be used; reads show nothing and writes are refused with this. */
	readonly unusable: string | undefined;
	readonly #kind: RecordKind<D>;
	readonly #notices: string[];
	readonly #pause: StorePause;

	/** Checks the folders and clears up what a crash may have left (an import half done, stray temporary files). */
	constructor(options: RecordFolderOptions<D>) {
		this.home = options.home;
		this.folder = join(options.home, options.name);
		this.#kind = options.kind;
		this.#notices = options.notices;
		this.#pause = options.pause ?? {};
		let unusable: string | undefined;
		try {
			checkOwnedFolder(this.home, {create: options.createHome === true});
			checkOwnedFolder(this.folder, {create: false});
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			unusable = `${options.kind.store} cannot be opened: ${error.message}`;
		}
		this.unusable = unusable;
		if (unusable) return;
		this.#notices.push(...recoverBatches(this.folder));
		for (const name of sweepTemps(this.folder))
			this.#notices.push(`${printable(name)} was put back after an interrupted change`);
	}

	fileOf(stem: string): string {
		return join(this.folder, `${stem}.json`);
	}

	/** Whether something (a record or not) holds this record's file name. */
	taken(stem: string): boolean {
		return entryAt(this.fileOf(stem)) !== undefined;
	}

	/** Refuses a change when the folder cannot be used; `outcome` says what did not happen. */
	requireUsable(outcome: string): void {
		if (this.unusable) throw this.#kind.fail(`${this.unusable}; ${outcome}`);
	}

	/** Reads every record file, by file name; moves damaged ones aside and sweeps stale temporary files. */
	scan(): {entries: RecordEntry<D>[]; problems: string[]} {
		const problems: string[] = [];
		if (this.unusable) return {entries: [], problems};
		let names: string[];
		try {
			// Never through a link: a folder swapped for one since the store opened is refused.
			if (!checkOwnedFolder(this.folder, {create: false})) return {entries: [], problems};
			names = readdirSync(this.folder).sort();
		} catch (error) {
			const why =
				error instanceof FileRefusedError
					? error.message
					: `cannot read ${printable(this.folder)} (${errnoOf(error) ?? 'error'})`;
			problems.push(`${why}; no ${this.#kind.plural} of yours are shown`);
			return {entries: [], problems};
		}
		// Leftovers of a crash in another process since this store opened.
		if (names.some(isTempName)) sweepTemps(this.folder);
		const entries: RecordEntry<D>[] = [];
		for (const fileName of names) {
			if (isTempName(fileName) || fileName.startsWith('.') || !fileName.endsWith('.json')) continue;
			const stem = fileName.slice(0, -'.json'.length);
			if (slug(stem) !== stem) {
				problems.push(
					`${printable(join(this.folder, fileName))}: not a ${this.#kind.noun} file name ` +
						'(lower-case letters, digits and hyphens); left as it is',
				);
				continue;
			}
			const entry = this.read(stem, problems);
			if (entry) entries.push(entry);
		}
		return {entries, problems};
	}

	/** One record file, or undefined when it is missing, unreadable (put in `problems`) or was moved aside. */
	read(stem: string, problems: string[] = []): RecordEntry<D> | undefined {
		const kind = this.#kind;
		const file = this.fileOf(stem);
		let read;
		try {
			// Regular files only, never through a link, capped: a FIFO or device here is reported, not opened.
			read = readRegularFile(file, {maxBytes: maxPlanBytes, followLinks: false, what: `${kind.noun} file`});
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			if (error.code !== 'not-found') problems.push(`${kind.label(stem)}: ${error.message}; left as it is`);
			return undefined;
		}
		const identity = read.identity!;
		let record: D;
		try {
			record = kind.decode(parseJsonBytes(file, read.bytes, identity).value);
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			const problem = error.message.slice(error.message.indexOf(': ') + 2);
			if (error.code === 'not-json' || error.code === 'encoding') {
				const backup = keepDamaged(file, identity);
				if (backup)
					this.#notices.push(
						`${kind.noun} file ${printable(file)} was damaged (${problem}); kept it as ` +
							`${printable(backup)}; the other ${kind.plural} are not affected`,
					);
				return undefined;
			}
			record = kind.refused(problem);
		}
		return {stem, file, record, identity};
	}

	/** Makes the folder (and the store's) if needed; `outcome` says what did not happen when it cannot. */
	#ensureFolder(outcome: string): void {
		this.requireUsable(outcome);
		try {
			checkOwnedFolder(this.home, {create: true});
			checkOwnedFolder(this.folder, {create: true});
		} catch (error) {
			if (error instanceof FileRefusedError) throw this.#kind.fail(`${error.message}; ${outcome}`);
			throw error;
		}
	}

	/**
	 * Writes one record whole; without `replace` only when its name is free.
	 * @returns 'exists' when the name is taken and `replace` is not set (nothing was written).
	 */
	write(stem: string, text: string, options: {replace: boolean}): 'done' | 'exists' {
		this.#ensureFolder('nothing was saved');
		try {
			writeFileAtomic(this.fileOf(stem), text, {replace: options.replace});
			return 'done';
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			if (error.code === 'exists') return 'exists';
			throw this.#kind.fail(`${withoutEnding(error)}; nothing was saved`);
		}
	}

	/**
	 * Writes several records as one change: all or none, even across a crash. Without `replace`, any
	 * name already taken refuses the whole change.
	 * @returns 'done', or the indexes of `records` whose names were taken (nothing was written), with
	 * `raced` set when another process took one after the check.
	 */
	writeAll(
		records: readonly {readonly stem: string; readonly text: string}[],
		options: {replace: boolean; where: string},
	): 'done' | {taken: number[]; raced: boolean} {
		this.requireUsable('nothing was imported');
		const takenNow = () => records.flatMap((r, i) => (this.taken(r.stem) ? [i] : []));
		if (!options.replace) {
			const taken = takenNow();
			if (taken.length) return {taken, raced: false};
		}
		this.#ensureFolder('nothing was imported');
		try {
			commitBatch(
				this.folder,
				records.map((r) => ({name: `${r.stem}.json`, data: r.text})),
				{replace: options.replace, ...(this.#pause.batch ? {pause: this.#pause.batch} : {})},
			);
			return 'done';
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			// Another process saved one of these names since the check above.
			if (error.code === 'exists') return {taken: takenNow(), raced: true};
			throw this.#kind.fail(`${options.where}: ${withoutEnding(error)}; nothing was imported`);
		}
	}

	/** Deletes a record only if its file is still the one read: a save landing in between is kept. */
	remove(entry: RecordEntry<D>): GuardedOutcome {
		this.requireUsable('nothing was changed');
		return this.#guarded(() => removeIfUnchanged(entry.file, entry.identity, this.#pause.guarded));
	}

	/** Replaces a record only if its file is still the one read. */
	replace(entry: RecordEntry<D>, text: string): GuardedOutcome {
		this.requireUsable('nothing was changed');
		return this.#guarded(() => replaceIfUnchanged(entry.file, text, entry.identity, this.#pause.guarded));
	}

	/** Runs a guarded change; the file layer's refusals become the store's errors. */
	#guarded(work: () => GuardedOutcome): GuardedOutcome {
		try {
			return work();
		} catch (error) {
			if (error instanceof FileRefusedError) throw this.#kind.fail(error.message);
			throw error;
		}
	}
}

/**
 * Writes an export file atomically where the user asked, never replacing a file unless `replace`.
 * @throws the store's error when the file exists or cannot be written.
 */
export function writeExportFile(
	file: string,
	text: string,
	options: {replace: boolean},
	fail: (message: string) => Error,
): void {
	try {
		writeFileAtomic(file, text, {replace: options.replace});
	} catch (error) {
		if (!(error instanceof FileRefusedError)) throw error;
		if (error.code === 'exists') throw fail(`${printable(file)} already exists; use --force to replace it`);
		throw fail(error.message);
	}
}
