/**
 * Several files written as one change (a multi-preset import): after a crash the folder shows all
 * of them or none, never some. A small journal file in the folder lists every target, the temporary
 * file staged for it and the name its old version is held under; it is written before anything is
 * touched. The next program to open the folder finds the journal of a dead process and either
 * finishes the clean-up (the change had completed) or rolls it back: new files removed, old ones
 * put back, temporary files deleted.
 */
import {randomBytes} from 'node:crypto';
import {lstatSync, readdirSync, renameSync} from 'node:fs';
import {hostname} from 'node:os';
import {basename, join} from 'node:path';
import {maxPlanBytes, readRegularFile} from './bounded-read.js';
import {
	commitStaged,
	entryAt,
	refuseNonRegular,
	removeQuietly,
	stageFile,
	syncFolder,
	tempPathFor,
	writeFileAtomic,
} from './atomic-write.js';
import {FileRefusedError, errnoOf} from './file-errors.js';
import {heldTag, putBack} from './guarded-change.js';
import {printable} from './printable.js';
import {isStale} from './temp-sweep.js';
import {decodeText} from './text-encoding.js';

const journalPattern = /^\.batch\.[0-9a-f]{24}\.journal$/;

interface JournalItem {
	readonly target: string;
	readonly temp: string;
	readonly held: string;
}

interface Journal {
	readonly pid: number;
	readonly host: string;
	readonly state: 'placing' | 'done';
	readonly items: readonly JournalItem[];
}

export interface BatchEntry {
	/** File name inside the batch's folder. */
	readonly name: string;
	readonly data: string | Uint8Array;
}

/** Test-only pause point: after the `index`-th file took its name. */
export type BatchPause = (point: 'placed', index: number) => void;

function writeJournal(path: string, journal: Journal, create: boolean): void {
	writeFileAtomic(path, `${JSON.stringify(journal)}\n`, {replace: !create});
}

/** Undoes whatever part of the batch is in place; safe to run twice. */
function rollBack(dir: string, journal: Journal): void {
	for (const item of journal.items) {
		const target = join(dir, item.target);
		const temp = join(dir, item.temp);
		const placed = entryAt(target);
		const staged = entryAt(temp);
		// Ours when the target is the very inode we staged (link() gave it a second name).
		if (placed && staged && placed.ino === staged.ino && placed.dev === staged.dev) removeQuietly(target);
		if (entryAt(join(dir, item.held))) putBack(join(dir, item.held), target);
		removeQuietly(temp);
	}
	syncFolder(dir);
}

function finish(dir: string, journal: Journal): void {
	for (const item of journal.items) {
		removeQuietly(join(dir, item.held));
		removeQuietly(join(dir, item.temp));
	}
	syncFolder(dir);
}

/**
 * Writes every entry into `dir` as one change. With `replace`, existing regular files are replaced;
 * without it, a name taken at commit time refuses the whole batch.
 * @throws FileRefusedError (`exists`, `not-regular`, `unwritable`, …); the folder is then as before.
 */
export function commitBatch(
	dir: string,
	entries: readonly BatchEntry[],
	options: {replace: boolean; pause?: BatchPause},
): void {
	const journalPath = join(dir, `.batch.${randomBytes(12).toString('hex')}.journal`);
	const items: JournalItem[] = entries.map((e) => {
		const target = join(dir, e.name);
		return {target: e.name, temp: basename(tempPathFor(target, 'new')), held: basename(tempPathFor(target, heldTag))};
	});
	const journal: Journal = {pid: process.pid, host: hostname(), state: 'placing', items};
	writeJournal(journalPath, journal, true);
	try {
		entries.forEach((e, i) => stageFile(join(dir, e.name), e.data, {temp: join(dir, items[i]!.temp)}));
		items.forEach((item, i) => {
			const target = join(dir, item.target);
			const existing = entryAt(target);
			if (existing) {
				if (!existing.isFile()) refuseNonRegular(target, existing);
				if (!options.replace)
					throw new FileRefusedError('exists', `${printable(target)} already exists; nothing was written`, 'EEXIST');
				renameSync(target, join(dir, item.held));
			}
			// Exclusive, and the temporary name stays until the end: the journal's proof of what is ours.
			commitStaged({temp: join(dir, item.temp), target}, {replace: false, keepTemp: true});
			options.pause?.('placed', i);
		});
	} catch (error) {
		rollBack(dir, journal);
		removeQuietly(journalPath);
		if (error instanceof FileRefusedError) throw error;
		throw new FileRefusedError(
			'unwritable',
			`cannot write to ${printable(dir)} (${errnoOf(error) ?? (error as Error).message}); nothing was written`,
			errnoOf(error),
		);
	}
	// The commit point: from here a crash is finished forwards, not rolled back.
	writeJournal(journalPath, {...journal, state: 'done'}, false);
	finish(dir, journal);
	removeQuietly(journalPath);
}

function isAlive(journal: Journal): boolean {
	if (journal.host !== hostname()) return true; // Cannot tell for another machine: age decides.
	try {
		process.kill(journal.pid, 0);
		return true;
	} catch (error) {
		return errnoOf(error) === 'EPERM';
	}
}

function readJournal(path: string): Journal | undefined {
	try {
		const text = decodeText(readRegularFile(path, {maxBytes: maxPlanBytes, followLinks: false}).bytes);
		if (!text.ok) return undefined;
		const value = JSON.parse(text.text) as Journal;
		const isName = (n: unknown) =>
			typeof n === 'string' && n.length > 0 && !n.includes('/') && !n.includes('\\') && n !== '.' && n !== '..';
		if (!Array.isArray(value.items) || !value.items.every((i) => isName(i.target) && isName(i.temp) && isName(i.held)))
			return undefined;
		return value;
	} catch {
		return undefined;
	}
}

/**
 * Finishes or rolls back the batches in `dir` whose writer died (or that are over an hour old).
 * @returns one notice per rolled-back batch.
 */
export function recoverBatches(dir: string, now = Date.now()): string[] {
	const notices: string[] = [];
	let names: string[];
	try {
		names = readdirSync(dir);
	} catch {
		return notices;
	}
	for (const name of names.filter((n) => journalPattern.test(n))) {
		const path = join(dir, name);
		const journal = readJournal(path);
		let mtimeMs: number;
		try {
			mtimeMs = lstatSync(path).mtimeMs;
		} catch {
			continue;
		}
		if (!journal) {
			if (isStale(mtimeMs, now)) removeQuietly(path);
			continue;
		}
		if (isAlive(journal) && !isStale(mtimeMs, now)) continue;
		if (journal.state === 'done') {
			finish(dir, journal);
		} else {
			rollBack(dir, journal);
			notices.push(
				`an earlier import of ${journal.items.length} file${journal.items.length === 1 ? '' : 's'} ` +
					'was interrupted; it was rolled back (nothing from it was kept, nothing it would have ' +
					'replaced was lost): run it again',
			);
		}
		removeQuietly(path);
	}
	return notices;
}
