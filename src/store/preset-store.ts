/**
 * The preset store: the built-in region templates (read-only, shipped in `presets/`) and the
 * user's own presets. The only module that imports `conf`.
 *
 * Storage design, and why:
 * - `conf` decides where the store lives (its standard per-user config folder, or `cwd` =
 *   `EVENECHO_HOME` for tests and shared drives) and keeps the store's small settings file
 *   (`config.json`: the layout and the newest record version written).
 * - Each user preset is its own file, `presets/<slug>.json`, written to a temporary file, flushed,
 *   and then renamed (replace) or hard-linked (create only if absent) into place. Two processes
 *   saving different presets therefore never touch the same file, so neither can lose the other's
 *   update; two saving the same name race on the exclusive link and exactly one wins. No lock file
 *   is needed, so no lock can go stale after a crash, and a crash mid-write leaves at most a
 *   stray temporary file (skipped, and swept after an hour), never a half-written preset. One
 *   shared JSON file (conf's usual way) would need a lock around every read-modify-write.
 * - Damage is contained to one file. A preset file that is not JSON at all is moved aside to
 *   `<file>.damaged-<time>` and a notice says so; one that is JSON but no longer validates (a
 *   tissue id since removed, a hand edit out of range) is left untouched and reported. A damaged
 *   `config.json` is moved aside the same way and rewritten. `clearInvalidConfig` stays off.
 */
import Conf from 'conf';
import {linkSync, mkdirSync, readdirSync, readFileSync, renameSync, statSync, unlinkSync} from 'node:fs';
import {dirname, join, resolve} from 'node:path';
import {parsePlanDocument, type PlanDocument} from '../plan/plan-schema.js';
import {commitExclusive, commitReplace, createFileAtomic, isTempName, removeQuietly, writeFileAtomic, writeTemp} from './atomic-file.js';
import {decodeImport, encodeBundle, type NamedPlan} from './preset-bundle.js';
import {currentRecordVersion, decodeRecord, encodeRecord, type DecodedRecord} from './preset-record.js';
import {checkPresetName, presetSlug, printable, slugOfUserId, userIdPrefix} from './safe-name.js';
import {PresetExistsError, PresetImportError, PresetInvalidError, PresetNotFoundError, PresetStoreError, TemplateReadOnlyError} from './store-errors.js';
import {loadTemplates, type Template} from './templates.js';
import {parseUntrustedJson, readBoundedText} from './untrusted-json.js';

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
}

export interface WriteOptions {
	/** Replace a user preset of the same name (CLI `--force`). @default false */
	readonly overwrite?: boolean;
}

/** Stray temporary files older than this are left over from a crash and removed. */
const staleTempMs = 60 * 60 * 1000;
const storeLayout = 'one-file-per-preset';

type Settings = Record<string, unknown>;

interface UserEntry {
	readonly id: string;
	readonly slug: string;
	readonly file: string;
	readonly record: DecodedRecord;
}

type Match = {kind: 'template'; template: Template} | {kind: 'user'; entry: UserEntry; entries: readonly UserEntry[]};

function errnoCode(error: unknown): string | undefined {
	return (error as NodeJS.ErrnoException | undefined)?.code;
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
	return value !== null && typeof value === 'object' && !Array.isArray(value);
}

function timestamp(): string {
	return `${new Date().toISOString().replace(/[:.]/g, '-')}-${process.pid}`;
}

/**
 * Moves a damaged file aside, byte for byte, to `<file>.damaged-<time>` (which the store never
 * reads). If the file changed between our read and the move (another process replaced it with a
 * good one), the move is undone. Returns the backup path, or undefined when nothing was moved.
 */
function moveAside(file: string, seenText: string): string | undefined {
	const backup = `${file}.damaged-${timestamp()}`;
	try {
		renameSync(file, backup);
	} catch {
		return undefined; // Gone already: another process dealt with it.
	}
	let moved: string | undefined;
	try {
		moved = readFileSync(backup, 'utf8').replace(/^\uFEFF/, '');
	} catch {
		moved = undefined;
	}
	if (moved !== undefined && moved !== seenText) {
		try {
			linkSync(backup, file);
			unlinkSync(backup);
			return undefined;
		} catch {
			// A newer file took the name meanwhile: keep this one as the backup.
		}
	}
	return backup;
}

/**
 * Opens the preset store. Never throws for a damaged or unreadable store: it reports that in
 * `notices` and keeps the templates available.
 */
export function openPresetStore(options: StoreOptions = {}): PresetStore {
	// An empty value means "not set", never the current folder.
	const home = options.home || process.env['EVENECHO_HOME'] || undefined;
	return new PresetStore(home === undefined ? undefined : resolve(home));
}

/** Templates and user presets; see the module comment for how user presets are stored. */
export class PresetStore {
	/** The store's folder (holds `config.json` and `presets/`). */
	readonly home: string;
	/** Where user presets live, one file each. */
	readonly presetsDir: string;
	/** Things the store did or found that the user should hear about (backups made, …). */
	readonly notices: string[] = [];
	readonly #conf: Conf<Settings> | undefined;
	/** Set when the folder cannot be used; writes are refused with this message. */
	readonly #unusable: string | undefined;

	/** Use `openPresetStore`. */
	constructor(home: string | undefined) {
		let damaged: {problem: string; text: string} | undefined;
		let conf: Conf<Settings> | undefined;
		let unusable: string | undefined;
		try {
			conf = new Conf<Settings>({
				projectName: 'evenecho',
				configName: 'config',
				...(home !== undefined ? {cwd: home} : {}),
				// Never wipe a file the user may need; a damaged one is moved aside below instead.
				clearInvalidConfig: false,
				deserialize: (text: string): Settings => {
					const parsed = parseUntrustedJson(text.replace(/^\uFEFF/, ''));
					if (parsed.ok && isPlainObject(parsed.value)) {
						damaged = undefined;
						return parsed.value;
					}
					damaged = {problem: parsed.ok ? 'not a JSON object' : parsed.problem, text: text.replace(/^\uFEFF/, '')};
					return {};
				},
			});
		} catch (error) {
			unusable = `the preset store at ${home ?? 'the standard per-user config folder'} cannot be opened (${errnoCode(error) ?? (error as Error).message})`;
		}
		this.#conf = conf;
		this.#unusable = unusable;
		this.home = conf ? dirname(conf.path) : (home ?? '');
		this.presetsDir = join(this.home, 'presets');
		if (unusable) {
			this.notices.push(`${unusable}; only the templates are available, and saving is not possible until that is fixed`);
			return;
		}
		if (damaged && conf) {
			const backup = moveAside(conf.path, damaged.text);
			if (backup) this.notices.push(`the store's settings file ${conf.path} was damaged (${damaged.problem}); kept it as ${backup} and started a fresh one; your presets are not affected`);
		}
		this.#ensureSettings();
	}

	/** Records the layout and version once; a store written by a newer program is flagged. */
	#ensureSettings(): void {
		const conf = this.#conf;
		if (!conf) return;
		try {
			const settings = conf.store;
			const written = typeof settings['recordVersion'] === 'number' ? settings['recordVersion'] : undefined;
			if (written !== undefined && written > currentRecordVersion) {
				this.notices.push(`this preset store was last written by a newer evenecho (record version ${written}); presets it wrote may not load here and are left unchanged`);
			}
			if (settings['layout'] !== storeLayout || written === undefined || written < currentRecordVersion) {
				conf.set({layout: storeLayout, recordVersion: Math.max(written ?? 0, currentRecordVersion)});
			}
		} catch {
			// A read-only store (e.g. a shared drive) still lists; writes report their own error.
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
	 * goes, so a crash in between leaves both rather than neither.
	 * @throws TemplateReadOnlyError for a template; PresetExistsError when the new name is taken.
	 */
	rename(from: string, to: string, options: WriteOptions = {}): Preset {
		const source = this.get(from);
		if (source.isTemplate) throw new TemplateReadOnlyError(source.id, 'renamed');
		const newName = checkPresetName(to, 'new name');
		const newSlug = presetSlug(newName);
		const oldFile = source.file;
		const savedAt = new Date();
		const text = encodeRecord(newName, source.plan, savedAt);
		if (newSlug === slugOfUserId(source.id)) {
			this.#writeRecord(newSlug, text, true);
		} else {
			this.#writeRecord(newSlug, text, options.overwrite === true);
			try {
				unlinkSync(oldFile);
			} catch (error) {
				if (errnoCode(error) !== 'ENOENT') this.notices.push(`renamed, but the old file ${oldFile} could not be removed (${errnoCode(error) ?? 'error'}); it now shows as a second preset`);
			}
		}
		return this.#written(newSlug, newName, source.plan, savedAt);
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
		try {
			unlinkSync(entry.file);
		} catch (error) {
			if (errnoCode(error) !== 'ENOENT') throw new PresetStoreError(`cannot delete ${entry.file} (${errnoCode(error) ?? 'error'}); nothing was changed`);
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
			if (options.overwrite) writeFileAtomic(file, bundle.text);
			else if (!createFileAtomic(file, bundle.text)) throw new PresetStoreError(`${file} already exists; use --force to replace it`);
		} catch (error) {
			if (error instanceof PresetStoreError) throw error;
			throw new PresetStoreError(`cannot write ${file} (${errnoCode(error) ?? (error as Error).message}); nothing was written`);
		}
		return {file, presets: bundle.presets};
	}

	/**
	 * Imports one plan (its `name` becomes the preset name) or a bundle from a file ("-": standard
	 * input). The file is untrusted: size cap, strict schema, no prototype keys, safe names. Any
	 * problem refuses the whole file and leaves the store as it was.
	 * @throws PresetImportError listing every problem; PresetExistsError when names are taken.
	 */
	importFrom(path: string, options: WriteOptions = {}): Preset[] {
		const where = path === '-' ? 'standard input' : path;
		const text = readBoundedText(path);
		if (!text.ok) throw new PresetImportError(`${where}: ${text.problem}; nothing was imported`);
		const json = parseUntrustedJson(text.text);
		if (!json.ok) throw new PresetImportError(`${where}: ${json.problem}; nothing was imported`);
		const decoded = decodeImport(json.value);
		if (!decoded.ok) throw new PresetImportError(`${where}: not a valid preset file; nothing was imported`, decoded.problems);
		this.#requireUsable();
		const overwrite = options.overwrite === true;
		const targets = decoded.items.map((item) => ({item, slug: presetSlug(item.name), file: join(this.presetsDir, `${presetSlug(item.name)}.json`)}));
		if (!overwrite) {
			const taken = targets.filter((t) => exists(t.file));
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
		// Stage every file first, so a full disk stops the import before anything is replaced.
		const staged: Array<{temp: string; file: string; slug: string}> = [];
		const savedAt = new Date();
		try {
			for (const t of targets) staged.push({temp: writeTemp(t.file, encodeRecord(t.item.name, t.item.plan, savedAt)), file: t.file, slug: t.slug});
		} catch (error) {
			for (const s of staged) removeQuietly(s.temp);
			throw new PresetStoreError(`cannot write to ${this.presetsDir} (${errnoCode(error) ?? (error as Error).message}); nothing was imported`);
		}
		const created: string[] = [];
		for (const [i, s] of staged.entries()) {
			if (overwrite) {
				commitReplace(s.temp, s.file);
			} else if (commitExclusive(s.temp, s.file)) {
				created.push(s.file);
			} else {
				// Another process saved this name just now: undo this import's own new files.
				for (const rest of staged.slice(i + 1)) removeQuietly(rest.temp);
				for (const f of created) removeQuietly(f);
				throw this.#existsError(s.slug, `${where}: "${targets[i]!.item.name}" was saved by another process meanwhile; nothing was imported`);
			}
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
			mkdirSync(this.presetsDir, {recursive: true});
		} catch (error) {
			throw new PresetStoreError(`cannot create ${this.presetsDir} (${errnoCode(error) ?? 'error'}); nothing was saved`);
		}
	}

	/** Writes one record file; exclusive unless `overwrite`. */
	#writeRecord(slug: string, text: string, overwrite: boolean): void {
		this.#ensurePresetsDir();
		const file = join(this.presetsDir, `${slug}.json`);
		let created: boolean;
		try {
			if (overwrite) {
				writeFileAtomic(file, text);
				created = true;
			} else {
				created = createFileAtomic(file, text);
			}
		} catch (error) {
			throw new PresetStoreError(`cannot write ${file} (${errnoCode(error) ?? (error as Error).message}); nothing was saved`);
		}
		if (!created) throw this.#existsError(slug);
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
			names = readdirSync(this.presetsDir).sort();
		} catch (error) {
			if (errnoCode(error) !== 'ENOENT') problems.push(`cannot read ${this.presetsDir} (${errnoCode(error) ?? 'error'}); showing templates only`);
			return {entries: [], problems};
		}
		const entries: UserEntry[] = [];
		for (const fileName of names) {
			if (isTempName(fileName)) {
				sweepIfStale(join(this.presetsDir, fileName));
				continue;
			}
			if (fileName.startsWith('.') || !fileName.endsWith('.json')) continue;
			const stem = fileName.slice(0, -'.json'.length);
			if (presetSlug(stem) !== stem) {
				problems.push(`${join(this.presetsDir, fileName)}: not a preset file name (lower-case letters, digits and hyphens); left as it is`);
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
		const text = readBoundedText(file);
		if (!text.ok) {
			if (text.code !== 'ENOENT') problems.push(`user preset ${id} (${file}) ${text.problem}; left as it is`);
			return undefined;
		}
		const json = parseUntrustedJson(text.text);
		if (!json.ok && json.kind === 'syntax') {
			const backup = moveAside(file, text.text);
			if (backup) this.notices.push(`user preset file ${file} was damaged (${json.problem}); kept it as ${backup}; the other presets are not affected`);
			return undefined;
		}
		const record: DecodedRecord = json.ok ? decodeRecord(json.value) : {status: 'invalid', problems: [json.problem]};
		return {id, slug, file, record};
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

function exists(file: string): boolean {
	try {
		statSync(file);
		return true;
	} catch {
		return false;
	}
}

function sweepIfStale(file: string): void {
	try {
		if (Date.now() - statSync(file).mtimeMs > staleTempMs) unlinkSync(file);
	} catch {
		// Another process may be sweeping or committing it.
	}
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
