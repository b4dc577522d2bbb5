/**
 * The preset store: the built-in region templates (read-only, shipped in `presets/`) and the
 * user's own presets. The only module that imports `conf`.
 *
 * Storage design, and why:
 * - `conf` decides where the store lives (its standard per-user config folder, or `cwd` =
 *   `EVENECHO_HOME` for tests and shared drives); the small settings file (`config.json`: the
 *   layout and the newest record version written) is read and written by the file layer
 *   (settings-file.ts). The store's folders must be real folders of the user's own.
 * - Every file is read and written through src/files: regular files only, never through a link,
 *   capped reads, the one atomic writer.
 * - Each user preset is its own file, `presets/<slug>.json`, written to a temporary file, flushed,
 *   and then renamed (replace) or hard-linked (create only if absent) into place. Two processes
 *   saving different presets therefore never touch the same file, so neither can lose the other's
 *   update; two saving the same name race on the exclusive link and exactly one wins. No lock file
 *   is needed, so no lock can go stale after a crash, and a crash mid-write leaves at most a
 *   stray temporary file (skipped, and swept after an hour), never a half-written preset. One
 *   shared JSON file (conf's usual way) would need a lock around every read-modify-write.
 * - Deleting or renaming away a preset checks that the file is still the one read (inode and
 *   SHA-256, guarded-change.ts), so a save landing in between is kept. A multi-preset import is one
 *   journalled batch (file-batch.ts): a crash half way is rolled back when the store next opens.
 * - Damage is contained to one file. A preset file that is not JSON at all is moved aside to
 *   `<file>.damaged-<time>` and a notice says so; one that is JSON but no longer validates (a
 *   tissue id since removed, a hand edit out of range) is left untouched and reported. A damaged
 *   `config.json` is moved aside the same way and rewritten. `clearInvalidConfig` stays off.
 */
import {readdirSync} from 'node:fs';
import {join, resolve} from 'node:path';
import {entryAt, isTempName, writeFileAtomic} from '../files/atomic-write.js';
import {maxPlanBytes, readRegularFile, type FileIdentity} from '../files/bounded-read.js';
import {commitBatch, recoverBatches, type BatchPause} from '../files/file-batch.js';
import {FileRefusedError, errnoOf} from '../files/file-errors.js';
import {moveAsideIfUnchanged, removeIfUnchanged, replaceIfUnchanged, type PausePoint} from '../files/guarded-change.js';
import {parseJsonBytes, readJsonFile} from '../files/json-input.js';
import {checkOwnedFolder} from '../files/owned-folder.js';
import {printable} from '../files/printable.js';
import {sweepTemps} from '../files/temp-sweep.js';
import {parsePlanDocument, type PlanDocument} from '../plan/plan-schema.js';
import {decodeImport, encodeBundle, type NamedPlan} from './preset-bundle.js';
import {currentRecordVersion, decodeRecord, encodeRecord, type DecodedRecord} from './preset-record.js';
import {checkPresetName, presetSlug, userIdPrefix} from './safe-name.js';
import {readSettings, settingsPath, storeHomeOf, writeSettings} from './settings-file.js';
import {PresetExistsError, PresetImportError, PresetInvalidError, PresetNotFoundError, PresetStoreError, TemplateReadOnlyError} from './store-errors.js';
import {loadTemplates, type Template} from './templates.js';

/** One line of `list`. User ids start with `user:`; template ids never do. */
export interface PresetSummary {
	readonly id: string;
	readonly name: string;
	readonly region: string;
	readonly isTemplate: boolean;
}

/** A template or a user preset, with its validated plan. */
export interface Preset extends PresetSummary {
	readonly plan: PlanDocument;
	/** Non-fatal remarks, e.g. another user preset file carries the same name. */
	readonly problems?: readonly string[];
	/** The file it is read from (the template file for templates). */
	readonly file: string;
	/** When a user preset was last written (ISO time), if recorded. */
	readonly savedAt?: string;
	/** Set when the stored record was an older version, migrated on this read. */
	readonly migratedFrom?: number;
}

export interface StoreOptions {
	/** The store's folder; default `EVENECHO_HOME`, else conf's standard per-user folder. */
	readonly home?: string;
	/**
	 * Tests only: called at the points where another process could act, so a test can land a rival
	 * write (or end the process) exactly there, without timing.
	 */
	readonly pauseAt?: StorePause;
}

/** Test-only pause points: a guarded delete or replace (rename, delete) and each file of an import. */
export interface StorePause {
	readonly guarded?: PausePoint;
	readonly batch?: BatchPause;
}

export interface WriteOptions {
	/** Replace a user preset of the same name (CLI `--force`). @default false */
	readonly overwrite?: boolean;
}

const storeLayout = 'one-file-per-preset';

interface UserEntry {
	readonly id: string;
	readonly slug: string;
	readonly file: string;
	readonly record: DecodedRecord;
	/** Who the file was when read: deletes and renames check it is still that file. */
	readonly identity: FileIdentity;
}

type Match = {kind: 'template'; template: Template} | {kind: 'user'; entry: UserEntry; entries: readonly UserEntry[]};

const errnoCode = errnoOf;

function timestamp(): string {
	return `${new Date().toISOString().replace(/[:.]/g, '-')}-${process.pid}`;
}

/**
 * Moves a damaged file aside, byte for byte, to `<file>.damaged-<time>` (which the store never
 * reads), only if it is still the file that was read: a good file another process wrote meanwhile
 * stays. Returns the backup path, or undefined when nothing was moved.
 */
function moveAside(file: string, seen: FileIdentity): string | undefined {
	const backup = `${file}.damaged-${timestamp()}`;
	return moveAsideIfUnchanged(file, backup, seen) === 'done' ? backup : undefined;
}

/**
 * Opens the preset store. Never throws for a damaged or unreadable store: it reports that in
 * `notices` and keeps the templates available.
 */
export function openPresetStore(options: StoreOptions = {}): PresetStore {
	// An empty value means "not set", never the current folder.
	const home = options.home || process.env['EVENECHO_HOME'] || undefined;
	return new PresetStore(home === undefined ? undefined : resolve(home), options.pauseAt);
}

/** Templates and user presets; see the module comment for how user presets are stored. */
export class PresetStore {
	/** The store's folder (holds `config.json` and `presets/`). */
	readonly home: string;
	/** Where user presets live, one file each. */
	readonly presetsDir: string;
	/** Things the store did or found that the user should hear about (backups made, …). */
	readonly notices: string[] = [];
	/** The settings file (`<home>/config.json`). */
	readonly #settingsFile: string;
	/** Set when the folder cannot be used; writes are refused with this message. */
	readonly #unusable: string | undefined;
	readonly #pause: StorePause;

	/** Use `openPresetStore`. */
	constructor(home: string | undefined, pause: StorePause = {}) {
		this.#pause = pause;
		this.#settingsFile = settingsPath(home);
		this.home = storeHomeOf(this.#settingsFile);
		this.presetsDir = join(this.home, 'presets');
		let unusable: string | undefined;
		try {
			checkOwnedFolder(this.home, {create: true});
			checkOwnedFolder(this.presetsDir, {create: false});
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			unusable = `the preset store cannot be opened: ${error.message}`;
		}
		this.#unusable = unusable;
		if (unusable) {
			this.notices.push(`${unusable}; only the templates are available, and saving is not possible until that is fixed`);
			return;
		}
		// What a crash may have left: an import half done, stray temporary files, held files.
		this.notices.push(...recoverBatches(this.presetsDir));
		for (const name of sweepTemps(this.presetsDir)) this.notices.push(`${printable(name)} was put back after an interrupted change`);
		sweepTemps(this.home);
		this.#ensureSettings();
	}

	/** Records the layout and version once; a store written by a newer program is flagged; a damaged settings file is kept aside. */
	#ensureSettings(): void {
		const file = this.#settingsFile;
		const read = readSettings(file);
		if (read.kind === 'refused') {
			this.notices.push(`the store's settings file: ${read.problem}; left as it is`);
			return;
		}
		let settings: Record<string, unknown> = read.kind === 'ok' ? read.settings : {};
		if (read.kind === 'damaged') {
			const backup = read.identity ? moveAside(file, read.identity) : undefined;
			if (backup) this.notices.push(`the store's settings file ${printable(file)} was damaged (${read.problem}); kept it as ${printable(backup)} and started a fresh one; your presets are not affected`);
			settings = {};
		}
		const written = typeof settings['recordVersion'] === 'number' ? settings['recordVersion'] : undefined;
		if (written !== undefined && written > currentRecordVersion) {
			this.notices.push(`this preset store was last written by a newer evenecho (record version ${written}); presets it wrote may not load here and are left unchanged`);
		}
		if (settings['layout'] !== storeLayout || written === undefined || written < currentRecordVersion) {
			try {
				writeSettings(file, {...settings, layout: storeLayout, recordVersion: Math.max(written ?? 0, currentRecordVersion)});
			} catch {
				// A read-only store (e.g. a shared drive) still lists; writes report their own error.
			}
		}
	}

	/** All templates, then the user presets by name; `problems` lists what could not be read. */
	list(): {presets: PresetSummary[]; problems: string[]} {
		const templates = loadTemplates();
		const scan = this.#scan();
		const users = scan.entries
			.filter((e) => e.record.status === 'ok')
			.map((e) => this.#userPreset(e))
			.sort((a, b) => a.name.localeCompare(b.name) || a.id.localeCompare(b.id));
		const problems = [...templates.problems, ...scan.problems];
		for (const e of scan.entries) {
			if (e.record.status === 'invalid') {
				problems.push(`user preset ${e.id} (${e.file}) no longer validates and is kept as it is: ${e.record.problems.join('; ')}. Fix the file or delete it with "evenecho presets delete ${e.id}".`);
			}
		}
		return {presets: [...templates.templates.map(templateSummary), ...users.map(summaryOf)], problems};
	}

	/**
	 * A template or user preset by id or name. Ids match exactly and win; names match ignoring case,
	 * accents, spaces and punctuation, and your own preset comes before a template of the same name.
	 * Undefined when nothing matches or the user preset no longer validates (see `get`).
	 */
	find(idOrName: string): Preset | undefined {
		const match = this.#match(idOrName);
		if (!match) return undefined;
		if (match.kind === 'template') return templatePreset(match.template);
		return match.entry.record.status === 'ok' ? this.#userPreset(match.entry, match.entries) : undefined;
	}

	/**
	 * Like `find`, but explains a miss.
	 * @throws PresetNotFoundError, or PresetInvalidError for a stored preset that no longer validates.
	 */
	get(idOrName: string): Preset {
		const match = this.#match(idOrName);
		if (!match) throw new PresetNotFoundError(printable(idOrName));
		if (match.kind === 'template') return templatePreset(match.template);
		const {entry} = match;
		if (entry.record.status === 'invalid') throw new PresetInvalidError(entry.id, entry.file, entry.record.problems);
		return this.#userPreset(entry, match.entries);
	}

	/**
	 * Saves a plan as a user preset. Saving under a template's name makes a user copy (id `user:…`);
	 * the template itself never changes.
	 * @throws PresetExistsError when a user preset has this name and `overwrite` is not set.
	 * @throws PresetNameError, PresetImportError (plan does not validate), PresetStoreError (disk).
	 */
	save(name: string, plan: PlanDocument, options: WriteOptions = {}): Preset {
		const checked = checkPresetName(name);
		const doc = checkPlan(plan, checked);
		const slug = presetSlug(checked);
		const savedAt = new Date();
		this.#writeRecord(slug, encodeRecord(checked, doc, savedAt), options.overwrite === true);
		return this.#written(slug, checked, doc, savedAt);
	}

	/**
	 * Gives a user preset a new name (and so a new id). The new file is in place before the old one
	 * goes, so a crash in between leaves both rather than neither; the old one goes only if it is
	 * still the file that was read, so a save landing in between is kept.
	 * @throws TemplateReadOnlyError for a template; PresetExistsError when the new name is taken.
	 */
	rename(from: string, to: string, options: WriteOptions = {}): Preset {
		const match = this.#match(from);
		if (!match) throw new PresetNotFoundError(printable(from));
		if (match.kind === 'template') throw new TemplateReadOnlyError(match.template.id, 'renamed');
		const source = this.get(from);
		const {entry} = match;
		const newName = checkPresetName(to, 'new name');
		const newSlug = presetSlug(newName);
		const savedAt = new Date();
		const text = encodeRecord(newName, source.plan, savedAt);
		this.#requireUsable();
		if (newSlug === entry.slug) {
			// Same file (the name changes only in case or punctuation): replace it if unchanged.
			const outcome = this.#guarded(() => replaceIfUnchanged(entry.file, text, entry.identity, this.#pause.guarded));
			if (outcome !== 'done') throw new PresetStoreError(`${entry.id} was ${outcome === 'gone' ? 'deleted' : 'changed'} by another process after it was read; nothing was renamed; run the command again`);
		} else {
			this.#writeRecord(newSlug, text, options.overwrite === true);
			const outcome = this.#guarded(() => removeIfUnchanged(entry.file, entry.identity, this.#pause.guarded));
			if (outcome === 'changed') {
				this.notices.push(`${entry.id} was saved again by another process while it was being renamed; that newer version is kept under its old name, beside the renamed copy`);
			}
		}
		return this.#written(newSlug, newName, source.plan, savedAt);
	}

	/** Runs a guarded change; the file layer's refusals become store errors. */
	#guarded<T>(work: () => T): T {
		try {
			return work();
		} catch (error) {
			if (error instanceof FileRefusedError) throw new PresetStoreError(`${error.message}`);
			throw error;
		}
	}

	/** Copies a template or user preset under a new name, as a user preset. */
	copy(from: string, to: string, options: WriteOptions = {}): Preset {
		return this.save(to, this.get(from).plan, options);
	}

	/**
	 * Deletes a user preset, including one that no longer validates.
	 * @throws TemplateReadOnlyError for a template; PresetNotFoundError.
	 */
	remove(idOrName: string): PresetSummary {
		const match = this.#match(idOrName);
		if (!match) throw new PresetNotFoundError(printable(idOrName));
		if (match.kind === 'template') throw new TemplateReadOnlyError(match.template.id, 'deleted');
		const {entry} = match;
		this.#requireUsable();
		// Only the file that was read: a save landing in between is kept, and the delete refused.
		const outcome = this.#guarded(() => removeIfUnchanged(entry.file, entry.identity, this.#pause.guarded));
		if (outcome === 'changed') {
			throw new PresetStoreError(`${entry.id} was saved again by another process after it was read; nothing was deleted; run the command again to delete the new version`);
		}
		const name = entry.record.name ?? entry.slug;
		return {id: entry.id, name, region: entry.record.status === 'ok' ? entry.record.plan.region : '', isTemplate: false};
	}

	/**
	 * The text of an export bundle: the named presets (templates allowed), or every valid user
	 * preset when none are named.
	 */
	exportBundle(idsOrNames: readonly string[] = []): {text: string; presets: PresetSummary[]} {
		let chosen: Preset[];
		if (idsOrNames.length === 0) {
			const scan = this.#scan();
			chosen = scan.entries.filter((e) => e.record.status === 'ok').map((e) => this.#userPreset(e));
			if (chosen.length === 0) throw new PresetStoreError('there are no user presets to export; name the templates or presets to export');
		} else {
			const byId = new Map<string, Preset>();
			for (const q of idsOrNames) {
				const p = this.get(q);
				byId.set(p.id, p);
			}
			chosen = [...byId.values()];
		}
		const items: NamedPlan[] = chosen.map((p) => ({name: p.name, plan: p.plan}));
		return {text: encodeBundle(items), presets: chosen.map(summaryOf)};
	}

	/**
	 * Writes an export bundle to a file (atomically).
	 * @throws PresetStoreError when the file exists and `overwrite` is not set, or cannot be written.
	 */
	exportTo(path: string, idsOrNames: readonly string[] = [], options: WriteOptions = {}): {file: string; presets: PresetSummary[]} {
		const bundle = this.exportBundle(idsOrNames);
		const file = resolve(path);
		try {
			writeFileAtomic(file, bundle.text, {replace: options.overwrite === true});
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			if (error.code === 'exists') throw new PresetStoreError(`${printable(file)} already exists; use --force to replace it`);
			throw new PresetStoreError(error.message);
		}
		return {file, presets: bundle.presets};
	}

	/**
	 * Imports one plan (its `name` becomes the preset name) or a bundle from a file. The file is
	 * untrusted: size cap, strict schema, no prototype keys, safe names. Any problem refuses the
	 * whole file and leaves the store as it was. (The CLI reads standard input itself, without
	 * blocking, and calls `importDocument`.)
	 * @throws PresetImportError listing every problem; PresetExistsError when names are taken.
	 */
	importFrom(path: string, options: WriteOptions = {}): Preset[] {
		let value: unknown;
		try {
			value = readJsonFile(path, {maxBytes: maxPlanBytes, what: 'preset file'}).value;
		} catch (error) {
			if (error instanceof FileRefusedError) throw new PresetImportError(`${error.message}; nothing was imported`);
			throw error;
		}
		return this.importDocument(value, printable(path), options);
	}

	/**
	 * Imports an already parsed plan or bundle; `where` names it in messages. All or nothing: the
	 * files are written as one journalled batch, so even a crash half way leaves none of them.
	 */
	importDocument(value: unknown, where: string, options: WriteOptions = {}): Preset[] {
		const decoded = decodeImport(value);
		if (!decoded.ok) throw new PresetImportError(`${where}: not a valid preset file; nothing was imported`, decoded.problems);
		this.#requireUsable();
		const overwrite = options.overwrite === true;
		const targets = decoded.items.map((item) => ({item, slug: presetSlug(item.name), file: join(this.presetsDir, `${presetSlug(item.name)}.json`)}));
		if (!overwrite) {
			const taken = targets.filter((t) => entryAt(t.file) !== undefined);
			if (taken.length) {
				const first = taken[0]!;
				throw new PresetExistsError(
					userIdPrefix + first.slug,
					first.item.name,
					`${where}: ${taken.length === 1 ? 'a user preset with this name already exists' : `${taken.length} user presets with these names already exist`}; use --force to replace ${taken.length === 1 ? 'it' : 'them'}; nothing was imported`,
					taken.map((t) => `"${t.item.name}" (${userIdPrefix}${t.slug})`),
				);
			}
		}
		this.#ensurePresetsDir();
		const savedAt = new Date();
		try {
			commitBatch(
				this.presetsDir,
				targets.map((t) => ({name: `${t.slug}.json`, data: encodeRecord(t.item.name, t.item.plan, savedAt)})),
				{replace: overwrite, ...(this.#pause.batch ? {pause: this.#pause.batch} : {})},
			);
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			if (error.code === 'exists') {
				const raced = targets.find((t) => entryAt(t.file) !== undefined);
				throw this.#existsError(raced?.slug ?? targets[0]!.slug, `${where}: ${raced ? `"${raced.item.name}"` : 'a preset'} was saved by another process meanwhile; nothing was imported`);
			}
			throw new PresetStoreError(`${where}: ${error.message.replace(/; nothing was written$/, '')}; nothing was imported`);
		}
		return targets.map((t) => this.#written(t.slug, t.item.name, t.item.plan, savedAt));
	}

	/** The preset just written, without reading the folder again. */
	#written(slug: string, name: string, plan: PlanDocument, savedAt: Date): Preset {
		return {
			id: userIdPrefix + slug,
			name,
			region: plan.region,
			isTemplate: false,
			plan: {...plan, name},
			file: join(this.presetsDir, `${slug}.json`),
			savedAt: savedAt.toISOString(),
		};
	}

	#requireUsable(): void {
		if (this.#unusable) throw new PresetStoreError(`${this.#unusable}; nothing was changed`);
	}

	#ensurePresetsDir(): void {
		this.#requireUsable();
		try {
			checkOwnedFolder(this.presetsDir, {create: true});
		} catch (error) {
			if (error instanceof FileRefusedError) throw new PresetStoreError(`${error.message}; nothing was saved`);
			throw error;
		}
	}

	/** Writes one record file; exclusive unless `overwrite`. */
	#writeRecord(slug: string, text: string, overwrite: boolean): void {
		this.#ensurePresetsDir();
		const file = join(this.presetsDir, `${slug}.json`);
		try {
			writeFileAtomic(file, text, {replace: overwrite});
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			if (error.code === 'exists') throw this.#existsError(slug);
			throw new PresetStoreError(`${error.message.replace(/; nothing was written$/, '')}; nothing was saved`);
		}
	}

	#existsError(slug: string, message?: string): PresetExistsError {
		const id = userIdPrefix + slug;
		const entry = this.#readEntry(`${slug}.json`);
		if (entry && entry.record.status === 'ok') return message ? new PresetExistsError(id, entry.record.name, message) : new PresetExistsError(id, entry.record.name);
		return new PresetExistsError(
			id,
			entry?.record.name ?? slug,
			message ?? `the user preset file for ${id} (${join(this.presetsDir, `${slug}.json`)}) already exists but does not validate; use --force to replace it, or delete it first`,
		);
	}

	#match(query: string): Match | undefined {
		const templates = loadTemplates().templates;
		const byId = templates.find((t) => t.id === query);
		if (byId) return {kind: 'template', template: byId};
		const {entries} = this.#scan();
		const userById = entries.find((e) => e.id === query);
		if (userById) return {kind: 'user', entry: userById, entries};
		const slug = presetSlug(query.normalize('NFC').trim());
		if (!slug) return undefined;
		const userBySlug = entries.find((e) => e.slug === slug) ?? entries.find((e) => e.record.name !== undefined && presetSlug(e.record.name) === slug);
		if (userBySlug) return {kind: 'user', entry: userBySlug, entries};
		const templateByName = templates.find((t) => presetSlug(t.plan.name) === slug);
		return templateByName ? {kind: 'template', template: templateByName} : undefined;
	}

	/** Reads every user preset file; moves damaged ones aside and sweeps stale temporary files. */
	#scan(): {entries: UserEntry[]; problems: string[]} {
		const problems: string[] = [];
		if (this.#unusable) return {entries: [], problems};
		let names: string[];
		try {
			// Never through a link: a presets folder swapped for one since the store opened is refused.
			if (!checkOwnedFolder(this.presetsDir, {create: false})) return {entries: [], problems};
			names = readdirSync(this.presetsDir).sort();
		} catch (error) {
			const why = error instanceof FileRefusedError ? error.message : `cannot read ${printable(this.presetsDir)} (${errnoCode(error) ?? 'error'})`;
			problems.push(`${why}; showing templates only`);
			return {entries: [], problems};
		}
		// Leftovers of a crash in another process since this store opened.
		if (names.some(isTempName)) sweepTemps(this.presetsDir);
		const entries: UserEntry[] = [];
		for (const fileName of names) {
			if (isTempName(fileName) || fileName.startsWith('.') || !fileName.endsWith('.json')) continue;
			const stem = fileName.slice(0, -'.json'.length);
			if (presetSlug(stem) !== stem) {
				problems.push(`${printable(join(this.presetsDir, fileName))}: not a preset file name (lower-case letters, digits and hyphens); left as it is`);
				continue;
			}
			const entry = this.#readEntry(fileName, problems);
			if (entry) entries.push(entry);
		}
		flagDuplicateNames(entries, problems);
		return {entries, problems};
	}

	/** One user preset file, or undefined when it is gone, unreadable (reported) or was moved aside. */
	#readEntry(fileName: string, problems: string[] = []): UserEntry | undefined {
		const slug = fileName.slice(0, -'.json'.length);
		const id = userIdPrefix + slug;
		const file = join(this.presetsDir, fileName);
		let read;
		try {
			// Regular files only, never through a link, capped: a FIFO or device here is reported, not opened.
			read = readRegularFile(file, {maxBytes: maxPlanBytes, followLinks: false, what: 'preset file'});
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			if (error.code !== 'not-found') problems.push(`user preset ${id}: ${error.message}; left as it is`);
			return undefined;
		}
		const identity = read.identity!;
		let record: DecodedRecord;
		try {
			record = decodeRecord(parseJsonBytes(file, read.bytes, identity).value);
		} catch (error) {
			if (!(error instanceof FileRefusedError)) throw error;
			if (error.code === 'not-json' || error.code === 'encoding') {
				const backup = moveAside(file, identity);
				const problem = error.message.slice(error.message.indexOf(': ') + 2);
				if (backup) this.notices.push(`user preset file ${printable(file)} was damaged (${problem}); kept it as ${printable(backup)}; the other presets are not affected`);
				return undefined;
			}
			record = {status: 'invalid', problems: [error.message.slice(error.message.indexOf(': ') + 2)]};
		}
		return {id, slug, file, record, identity};
	}

	#userPreset(entry: UserEntry, all?: readonly UserEntry[]): Preset {
		const record = entry.record;
		if (record.status !== 'ok') throw new PresetInvalidError(entry.id, entry.file, record.problems); // callers filter first
		const twins = (all ?? []).filter((e) => e !== entry && e.record.name !== undefined && presetSlug(e.record.name) === presetSlug(record.name));
		return {
			id: entry.id,
			name: record.name,
			region: record.plan.region,
			isTemplate: false,
			plan: record.plan,
			file: entry.file,
			...(record.savedAt !== undefined ? {savedAt: record.savedAt} : {}),
			...(record.migratedFrom !== undefined ? {migratedFrom: record.migratedFrom} : {}),
			...(twins.length ? {problems: twins.map((t) => `${t.id} carries the same name`)} : {}),
		};
	}
}

function summaryOf(p: PresetSummary): PresetSummary {
	return {id: p.id, name: p.name, region: p.region, isTemplate: p.isTemplate};
}

function templateSummary(t: Template): PresetSummary {
	return {id: t.id, name: t.plan.name, region: t.plan.region, isTemplate: true};
}

function templatePreset(t: Template): Preset {
	return {...templateSummary(t), plan: t.plan, file: t.file};
}

/** Validates a plan handed to `save` (the console may pass one it built itself). */
function checkPlan(plan: PlanDocument, name: string): PlanDocument {
	const parsed = parsePlanDocument({...plan, name});
	if (!parsed.ok) throw new PresetImportError(`the plan for "${name}" does not validate; nothing was saved`, parsed.errors);
	return parsed.value;
}

/** Hand-copied files can carry the same name under two ids; say so rather than pick silently. */
function flagDuplicateNames(entries: readonly UserEntry[], problems: string[]): void {
	const bySlug = new Map<string, string[]>();
	for (const e of entries) {
		if (e.record.status !== 'ok') continue;
		const key = presetSlug(e.record.name);
		bySlug.set(key, [...(bySlug.get(key) ?? []), e.id]);
	}
	for (const ids of bySlug.values()) {
		if (ids.length > 1) problems.push(`user presets ${ids.join(' and ')} carry the same name; rename or delete one`);
	}
}
