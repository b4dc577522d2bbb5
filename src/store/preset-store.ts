/**
 * The preset store: the built-in region templates (read-only, shipped in `presets/`) and the
 * user's own presets, one file each in `presets/` of the store's folder, kept by the shared
 * record-folder machinery (record-folder.ts says how a record is written, guarded, and kept safe
 * from damage and crashes). This file adds what is the presets' own: templates beside user presets,
 * lookup by id or name, and the store's settings file. The only module that imports `conf`.
 *
 * `conf` decides where the store lives (its standard per-user config folder, or `cwd` =
 * `EVENECHO_HOME` for tests and shared drives); the small settings file (`config.json`: the layout
 * and the newest record version written) is read and written by the file layer (settings-file.ts).
 * A damaged `config.json` is moved aside the same way as a damaged record and rewritten;
 * `clearInvalidConfig` stays off.
 */
import {resolve} from 'node:path';
import {maxPlanBytes} from '../files/bounded-read.js';
import {FileRefusedError} from '../files/file-errors.js';
import {readJsonFile} from '../files/json-input.js';
import {printable} from '../files/printable.js';
import {sweepTemps} from '../files/temp-sweep.js';
import {parsePlanDocument, type PlanDocument} from '../plan/plan-schema.js';
import {decodeImport, encodeBundle, type NamedPlan} from './preset-bundle.js';
import {currentRecordVersion, decodeRecord, encodeRecord, type DecodedRecord} from './preset-record.js';
import {
	keepDamaged,
	RecordFolder,
	writeExportFile,
	type RecordEntry,
	type RecordKind,
	type StorePause,
} from './record-folder.js';
import {checkPresetName, presetSlug, userIdPrefix} from './safe-name.js';
import {readSettings, settingsPath, storeHomeOf, writeSettings} from './settings-file.js';
import {
	PresetExistsError,
	PresetImportError,
	PresetInvalidError,
	PresetNotFoundError,
	PresetStoreError,
	TemplateReadOnlyError,
} from './store-errors.js';
import {loadTemplates, type Template} from './templates.js';

export type {StorePause};

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

export interface WriteOptions {
	/** Replace a user preset of the same name (CLI `--force`). @default false */
	readonly overwrite?: boolean;
}

const storeLayout = 'one-file-per-preset';

/** A user preset file as read, with its id. */
interface UserEntry extends RecordEntry<DecodedRecord> {
	readonly id: string;
}

type Match = {kind: 'template'; template: Template} | {kind: 'user'; entry: UserEntry; entries: readonly UserEntry[]};

/** How user preset files are read and named in messages. */
const presetKind: RecordKind<DecodedRecord> = {
	store: 'the preset store',
	noun: 'user preset',
	plural: 'presets',
	label: (stem) => `user preset ${userIdPrefix}${stem}`,
	decode: decodeRecord,
	refused: (problem) => ({status: 'invalid', problems: [problem]}),
	fail: (message) => new PresetStoreError(message),
};

function userEntry(entry: RecordEntry<DecodedRecord>): UserEntry {
	return {...entry, id: userIdPrefix + entry.stem};
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

/** Templates and user presets; see the module comment and record-folder.ts for how user presets are stored. */
export class PresetStore {
	/** The store's folder (holds `config.json` and `presets/`). */
	readonly home: string;
	/** Where user presets live, one file each. */
	readonly presetsDir: string;
	/** Things the store did or found that the user should hear about (backups made, …). */
	readonly notices: string[] = [];
	/** The settings file (`<home>/config.json`). */
	readonly #settingsFile: string;
	readonly #records: RecordFolder<DecodedRecord>;

	/** Use `openPresetStore`. */
	constructor(home: string | undefined, pause: StorePause = {}) {
		this.#settingsFile = settingsPath(home);
		this.home = storeHomeOf(this.#settingsFile);
		this.#records = new RecordFolder({
			home: this.home,
			name: 'presets',
			kind: presetKind,
			createHome: true,
			notices: this.notices,
			pause,
		});
		this.presetsDir = this.#records.folder;
		const unusable = this.#records.unusable;
		if (unusable) {
			this.notices.push(
				`${unusable}; only the templates are available, and saving is not possible until that is fixed`,
			);
			return;
		}
		// A crash while the settings file was written leaves a stray temporary file beside it.
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
			const backup = read.identity ? keepDamaged(file, read.identity) : undefined;
			if (backup)
				this.notices.push(
					`the store's settings file ${printable(file)} was damaged (${read.problem}); kept it as ` +
						`${printable(backup)} and started a fresh one; your presets are not affected`,
				);
			settings = {};
		}
		const written = typeof settings['recordVersion'] === 'number' ? settings['recordVersion'] : undefined;
		if (written !== undefined && written > currentRecordVersion) {
			this.notices.push(
				`this preset store was last written by a newer evenecho (record version ${written}); ` +
					'presets it wrote may not load here and are left unchanged',
			);
		}
		if (settings['layout'] !== storeLayout || written === undefined || written < currentRecordVersion) {
			try {
				writeSettings(file, {
					...settings,
					layout: storeLayout,
					recordVersion: Math.max(written ?? 0, currentRecordVersion),
				});
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
				problems.push(
					`user preset ${e.id} (${e.file}) no longer validates and is kept as it is: ` +
						`${e.record.problems.join('; ')}. ` +
						`Fix the file or delete it with "evenecho presets delete ${e.id}".`,
				);
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
		if (newSlug === entry.stem) {
			// Same file (the name changes only in case or punctuation): replace it if unchanged.
			const outcome = this.#records.replace(entry, text);
			if (outcome !== 'done') {
				throw new PresetStoreError(
					`${entry.id} was ${outcome === 'gone' ? 'deleted' : 'changed'} by another process after it was read; ` +
						'nothing was renamed; run the command again',
				);
			}
		} else {
			this.#writeRecord(newSlug, text, options.overwrite === true);
			if (this.#records.remove(entry) === 'changed') {
				this.notices.push(
					`${entry.id} was saved again by another process while it was being renamed; that newer ` +
						'version is kept under its old name, beside the renamed copy',
				);
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
		// Only the file that was read: a save landing in between is kept, and the delete refused.
		if (this.#records.remove(entry) === 'changed') {
			throw new PresetStoreError(
				`${entry.id} was saved again by another process after it was read; nothing was deleted; ` +
					'run the command again to delete the new version',
			);
		}
		const name = entry.record.name ?? entry.stem;
		return {
			id: entry.id,
			name,
			region: entry.record.status === 'ok' ? entry.record.plan.region : '',
			isTemplate: false,
		};
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
			if (chosen.length === 0)
				throw new PresetStoreError('there are no user presets to export; name the templates or presets to export');
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
	exportTo(
		path: string,
		idsOrNames: readonly string[] = [],
		options: WriteOptions = {},
	): {file: string; presets: PresetSummary[]} {
		const bundle = this.exportBundle(idsOrNames);
		const file = resolve(path);
		writeExportFile(file, bundle.text, {replace: options.overwrite === true}, presetKind.fail);
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
		if (!decoded.ok)
			throw new PresetImportError(`${where}: not a valid preset file; nothing was imported`, decoded.problems);
		const overwrite = options.overwrite === true;
		const savedAt = new Date();
		const targets = decoded.items.map((item) => ({
			item,
			stem: presetSlug(item.name),
			text: encodeRecord(item.name, item.plan, savedAt),
		}));
		const outcome = this.#records.writeAll(targets, {replace: overwrite, where});
		if (outcome !== 'done') {
			const taken = outcome.taken.map((i) => targets[i]!);
			const first = taken[0];
			const existing =
				taken.length === 1
					? 'a user preset with this name already exists'
					: `${taken.length} user presets with these names already exist`;
			if (outcome.raced) {
				throw this.#existsError(
					first?.stem ?? targets[0]!.stem,
					`${where}: ${first ? `"${first.item.name}"` : 'a preset'} was saved by another process meanwhile; nothing was imported`,
				);
			}
			throw new PresetExistsError(
				userIdPrefix + first!.stem,
				first!.item.name,
				`${where}: ${existing}; use --force to replace ${taken.length === 1 ? 'it' : 'them'}; nothing was imported`,
				taken.map((t) => `"${t.item.name}" (${userIdPrefix}${t.stem})`),
			);
		}
		return targets.map((t) => this.#written(t.stem, t.item.name, t.item.plan, savedAt));
	}

	/** The preset just written, without reading the folder again. */
	#written(slug: string, name: string, plan: PlanDocument, savedAt: Date): Preset {
		return {
			id: userIdPrefix + slug,
			name,
			region: plan.region,
			isTemplate: false,
			plan: {...plan, name},
			file: this.#records.fileOf(slug),
			savedAt: savedAt.toISOString(),
		};
	}

	/** Writes one record file; exclusive unless `overwrite`. */
	#writeRecord(slug: string, text: string, overwrite: boolean): void {
		if (this.#records.write(slug, text, {replace: overwrite}) === 'exists') throw this.#existsError(slug);
	}

	#existsError(slug: string, message?: string): PresetExistsError {
		const id = userIdPrefix + slug;
		const entry = this.#records.read(slug);
		if (entry && entry.record.status === 'ok')
			return message
				? new PresetExistsError(id, entry.record.name, message)
				: new PresetExistsError(id, entry.record.name);
		return new PresetExistsError(
			id,
			entry?.record.name ?? slug,
			message ??
				`the user preset file for ${id} (${this.#records.fileOf(slug)}) already exists but does ` +
					'not validate; use --force to replace it, or delete it first',
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
		const userBySlug =
			entries.find((e) => e.stem === slug) ??
			entries.find((e) => e.record.name !== undefined && presetSlug(e.record.name) === slug);
		if (userBySlug) return {kind: 'user', entry: userBySlug, entries};
		const templateByName = templates.find((t) => presetSlug(t.plan.name) === slug);
		return templateByName ? {kind: 'template', template: templateByName} : undefined;
	}

	/** Every user preset file (damaged ones moved aside), with names carried twice flagged. */
	#scan(): {entries: UserEntry[]; problems: string[]} {
		const scan = this.#records.scan();
		const entries = scan.entries.map(userEntry);
		flagDuplicateNames(entries, scan.problems);
		return {entries, problems: scan.problems};
	}

	#userPreset(entry: UserEntry, all?: readonly UserEntry[]): Preset {
		const record = entry.record;
		if (record.status !== 'ok') throw new PresetInvalidError(entry.id, entry.file, record.problems); // callers filter first
		const twins = (all ?? []).filter(
			(e) => e !== entry && e.record.name !== undefined && presetSlug(e.record.name) === presetSlug(record.name),
		);
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
	if (!parsed.ok)
		throw new PresetImportError(`the plan for "${name}" does not validate; nothing was saved`, parsed.errors);
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
