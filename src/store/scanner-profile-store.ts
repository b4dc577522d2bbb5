/**
 * Scanner profiles in the user's store: one file per profile, `scanner-profiles/<id>.json`, beside
 * the presets in the same store folder (EVENECHO_HOME, else the standard per-user folder).
 *
 * The files are kept by the same record-folder machinery as the presets (record-folder.ts), so the
 * promises are the presets' own: a profile is written whole or not at all; a name is created
 * exclusively, so two saves of one name cannot both win; delete and rename change a file only if it
 * is still the one that was read; the folders must be the user's own; a file that is not JSON is
 * moved aside and reported; imports are parsed strictly and validated, written as one change, and a
 * bad one changes nothing.
 */
import {resolve} from 'node:path';
import {parseProfile, profileFormat, type ScannerProfile} from '../calibration/profile-document.js';
import {UsageError} from '../errors/usage-error.js';
import {printable} from '../files/printable.js';
import {slug} from '../files/slug.js';
import {parseStrictJson} from '../files/strict-json.js';
import {RecordFolder, type RecordEntry, type RecordKind, type StorePause} from './record-folder.js';
import {settingsPath, storeHomeOf} from './settings-file.js';

export const profileBundleFormat = 'evenecho-scanner-profiles/1';
const maxBundleProfiles = 200;
/** A profile name: 1–60 characters, letters or digits first (the same shape as a preset name). */
const namePattern = /^[\p{L}\p{N}][\p{L}\p{M}\p{N} \-_.,()+'&]*$/u;

/** The request was refused; nothing stored changed. Exit code 2 in the CLI. */
export class ScannerStoreError extends UsageError {
	constructor(message: string, details: readonly string[] = []) {
		super(message, details);
		this.name = 'ScannerStoreError';
	}
}

export function checkProfileName(input: string, field = '--name'): {name: string; id: string} {
	const name = input.normalize('NFC').trim();
	const length = [...name].length;
	if (length < 1 || length > 60 || !namePattern.test(name)) {
		throw new ScannerStoreError(
			`${field}: "${printable(name)}" is not a profile name: 1 to 60 characters, letters, ` +
				`digits, spaces and - _ . , ( ) + ' &, starting with a letter or digit`,
		);
	}
	const id = slug(name, {maxChars: 64});
	if (!id) throw new ScannerStoreError(`${field}: "${printable(name)}" has no letters or digits that can name a file`);
	return {name, id};
}

/** What reading one stored profile gave; an invalid one is reported and left as it is. */
type ProfileRead =
	| {readonly status: 'ok'; readonly profile: ScannerProfile}
	| {readonly status: 'invalid'; readonly problem: string};

const profileKind: RecordKind<ProfileRead> = {
	store: 'the scanner-profile store',
	noun: 'scanner profile',
	plural: 'profiles',
	label: (stem) => `scanner profile ${stem}`,
	decode(value) {
		const parsed = parseProfile(value);
		return parsed.ok
			? {status: 'ok', profile: parsed.value}
			: {status: 'invalid', problem: parsed.errors[0] ?? 'does not validate'};
	},
	refused: (problem) => ({status: 'invalid', problem}),
	fail: (message) => new ScannerStoreError(message),
};

function invalidText(entry: RecordEntry<ProfileRead>, problem: string): string {
	return `${printable(entry.file)}: no longer a valid profile (${problem}); left untouched`;
}

/** The stored text of a profile, stamped with the time it is written. */
function profileText(profile: ScannerProfile): string {
	return `${JSON.stringify({...profile, savedAt: new Date().toISOString()}, null, '\t')}\n`;
}

export interface ProfileListing {
	readonly profiles: readonly ScannerProfile[];
	/** Files that could not be read or no longer validate (left untouched), and what the store did: reported. */
	readonly problems: readonly string[];
}

/** Opens the profile folder under the store's home: `home`, else EVENECHO_HOME, else the standard per-user folder. */
export function openScannerProfileStore(home?: string): ScannerProfileStore {
	const chosen = home || process.env['EVENECHO_HOME'];
	return new ScannerProfileStore(chosen ? resolve(chosen) : storeHomeOf(settingsPath(undefined)));
}

export class ScannerProfileStore {
	readonly folder: string;
	/** What the store did or found (a damaged file moved aside, an import rolled back); `list` reports them. */
	readonly notices: string[] = [];
	readonly #records: RecordFolder<ProfileRead>;

	/** `pause` is for tests only: see the preset store's `StoreOptions`. */
	constructor(
		readonly home: string,
		pause: StorePause = {},
	) {
		this.#records = new RecordFolder({home, name: 'scanner-profiles', kind: profileKind, notices: this.notices, pause});
		this.folder = this.#records.folder;
		if (this.#records.unusable)
			this.notices.push(`${this.#records.unusable}; scanner profiles cannot be read or saved until that is fixed`);
	}

	/** Every valid profile by id; the problems include the store's notices, each reported once. */
	list(): ProfileListing {
		const scan = this.#records.scan();
		const profiles: ScannerProfile[] = [];
		const problems = [...scan.problems];
		for (const entry of scan.entries) {
			if (entry.record.status === 'ok') profiles.push(entry.record.profile);
			else problems.push(invalidText(entry, entry.record.problem));
		}
		return {profiles, problems: [...this.notices.splice(0), ...problems]};
	}

	#find(idOrName: string): {entry: RecordEntry<ProfileRead>; profile: ScannerProfile} {
		const {id} = checkProfileName(idOrName, 'profile');
		if (this.#records.unusable) throw new ScannerStoreError(this.#records.unusable);
		const problems: string[] = [];
		const entry = this.#records.read(id, problems);
		if (problems.length) throw new ScannerStoreError(problems[0]!);
		if (!entry)
			throw new ScannerStoreError(
				`no scanner profile "${printable(idOrName)}" (evenecho scanner list shows them)`,
				this.notices.splice(0),
			);
		if (entry.record.status !== 'ok') throw new ScannerStoreError(invalidText(entry, entry.record.problem));
		return {entry, profile: entry.record.profile};
	}

	get(idOrName: string): ScannerProfile {
		return this.#find(idOrName).profile;
	}

	/** Stores a profile under its id; refuses to replace one unless `replace`. */
	save(profile: ScannerProfile, options: {replace: boolean}): void {
		if (this.#records.write(profile.id, profileText(profile), options) === 'exists') {
			throw new ScannerStoreError(
				`a scanner profile "${profile.id}" already exists; use --force to replace it, or --name to choose another name`,
			);
		}
	}

	/** Deletes a profile only if its file is still the one read: a save landing in between is kept. */
	delete(idOrName: string): ScannerProfile {
		const found = this.#find(idOrName);
		if (this.#records.remove(found.entry) === 'changed') {
			throw new ScannerStoreError(
				`the profile "${found.profile.id}" changed while being deleted (another save?); nothing was deleted`,
			);
		}
		return found.profile;
	}

	/**
	 * New name (and so new id). The new file is in place before the old one goes, and the old one
	 * goes only if it is still the file that was read, so a save landing in between is kept.
	 */
	rename(idOrName: string, newName: string, options: {replace: boolean}): ScannerProfile {
		const found = this.#find(idOrName);
		const {name, id} = checkProfileName(newName);
		const renamed = {...found.profile, id, name};
		if (id === found.profile.id) {
			// Same file (the name changes only in case or punctuation): replace it if unchanged.
			const outcome = this.#records.replace(found.entry, profileText(renamed));
			if (outcome !== 'done')
				throw new ScannerStoreError(
					`the profile "${id}" was ${outcome === 'gone' ? 'deleted' : 'changed'} by another process after it was read; nothing was renamed`,
				);
			return renamed;
		}
		this.save(renamed, options);
		if (this.#records.remove(found.entry) === 'changed') {
			this.notices.push(
				`"${found.profile.id}" was saved again by another process while it was being renamed; ` +
					'that newer version is kept beside the renamed copy',
			);
		}
		return renamed;
	}

	/** A bundle of the chosen profiles (all when none are named). */
	exportBundle(ids: readonly string[]): string {
		const profiles = ids.length ? ids.map((id) => this.get(id)) : this.list().profiles;
		return `${JSON.stringify({format: profileBundleFormat, exportedAt: new Date().toISOString(), profiles}, null, '\t')}\n`;
	}

	/**
	 * Imports one profile file or a bundle. Everything is checked before anything is written; a
	 * profile that exists is refused unless `replace`, and then nothing at all is written. The files
	 * are written as one journalled change, so even a crash half way leaves none of them.
	 */
	importText(text: string, source: string, options: {replace: boolean}): ScannerProfile[] {
		const where = printable(source);
		const json = parseStrictJson(text.replace(/^\uFEFF/, ''));
		if (!json.ok) throw new ScannerStoreError(`${where}: ${json.problem}; nothing was imported`);
		const value = json.value as {format?: unknown; profiles?: unknown};
		let items: unknown[];
		if (value && typeof value === 'object' && value.format === profileBundleFormat) {
			if (!Array.isArray(value.profiles) || value.profiles.length > maxBundleProfiles) {
				throw new ScannerStoreError(
					`${where}: profiles must be a list of at most ${maxBundleProfiles}; nothing was imported`,
				);
			}
			items = value.profiles;
		} else if (value && typeof value === 'object' && value.format === profileFormat) {
			items = [value];
		} else {
			throw new ScannerStoreError(
				`${where}: format must be "${profileFormat}" or "${profileBundleFormat}"; nothing was imported`,
			);
		}
		const problems: string[] = [];
		const profiles: ScannerProfile[] = [];
		items.forEach((item, i) => {
			const parsed = parseProfile(item);
			if (!parsed.ok) problems.push(...parsed.errors.map((e) => `profiles.${i}.${e}`));
			else if (checkProfileName(parsed.value.name, `profiles.${i}.name`).id !== parsed.value.id)
				problems.push(`profiles.${i}.id: must be the file-name form of its name`);
			else profiles.push(parsed.value);
		});
		if (problems.length)
			throw new ScannerStoreError(`${where}: not valid scanner profiles; nothing was imported`, problems.slice(0, 20));
		const ids = profiles.map((p) => p.id);
		const twice = ids.find((id, i) => ids.indexOf(id) !== i);
		if (twice) throw new ScannerStoreError(`${where}: the profile "${twice}" appears twice; nothing was imported`);
		const outcome = this.#records.writeAll(
			profiles.map((p) => ({stem: p.id, text: profileText(p)})),
			{replace: options.replace, where},
		);
		if (outcome !== 'done') {
			const clash = outcome.taken.map((i) => `"${ids[i]}"`);
			if (outcome.raced)
				throw new ScannerStoreError(
					`${where}: ${clash[0] ?? 'a profile'} was saved by another process meanwhile; nothing was imported`,
				);
			throw new ScannerStoreError(
				`${where}: ${clash.join(', ')} already exist${clash.length > 1 ? '' : 's'}; use --force to replace; nothing was imported`,
			);
		}
		return profiles;
	}
}
