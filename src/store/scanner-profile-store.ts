/**
 * Scanner profiles in the user's store: one file per profile, `scanner-profiles/<id>.json`, beside
 * the presets in the same store folder (EVENECHO_HOME, else the standard per-user folder).
 *
 * The guarantees are the presets' and come from the same shared machinery (src/files): a profile
 * is written whole or not at all (exclusive temp, flushed, then linked or renamed into place); a
 * name is created exclusively, so two saves of one name cannot both win; delete and rename change
 * a file only if it is still the one that was read; the folder must be the user's own; imports are
 * parsed strictly and validated, and a bad one changes nothing.
 */
import {readdirSync} from 'node:fs';
import {join, resolve} from 'node:path';
import {openPresetStore} from './preset-store.js';
import {parseProfile, profileFormat, type ScannerProfile} from '../calibration/profile-document.js';
import {UsageError} from '../errors/usage-error.js';
import {writeFileAtomic, isTempName} from '../files/atomic-write.js';
import {maxPlanBytes, readRegularFile, type FileIdentity} from '../files/bounded-read.js';
import {FileRefusedError} from '../files/file-errors.js';
import {removeIfUnchanged} from '../files/guarded-change.js';
import {checkOwnedFolder} from '../files/owned-folder.js';
import {printable} from '../files/printable.js';
import {slug} from '../files/slug.js';
import {parseStrictJson} from '../files/strict-json.js';
import {sweepTemps} from '../files/temp-sweep.js';

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
		throw new ScannerStoreError(`${field}: "${printable(name)}" is not a profile name: 1 to 60 characters, letters, digits, spaces and - _ . , ( ) + ' &, starting with a letter or digit`);
	}
	const id = slug(name, {maxChars: 64});
	if (!id) throw new ScannerStoreError(`${field}: "${printable(name)}" has no letters or digits that can name a file`);
	return {name, id};
}

interface StoredProfile {
	readonly profile: ScannerProfile;
	readonly file: string;
	readonly identity: FileIdentity;
}

export interface ProfileListing {
	readonly profiles: readonly ScannerProfile[];
	/** Files that could not be read or no longer validate: left untouched, reported. */
	readonly problems: readonly string[];
}

/** Opens the profile folder under the store's home: the preset store's folder, found by it. */
export function openScannerProfileStore(home?: string): ScannerProfileStore {
	const chosen = home || process.env['EVENECHO_HOME'];
	return new ScannerProfileStore(chosen ? resolve(chosen) : openPresetStore().home);
}

export class ScannerProfileStore {
	readonly folder: string;

	constructor(readonly home: string) {
		this.folder = join(home, 'scanner-profiles');
	}

	#read(file: string): StoredProfile | {problem: string} {
		let bytes: Buffer;
		let identity: FileIdentity | undefined;
		try {
			({bytes, identity} = readRegularFile(file, {maxBytes: maxPlanBytes, followLinks: false, what: 'scanner profile'}));
		} catch (error) {
			if (error instanceof FileRefusedError) return {problem: error.message};
			throw error;
		}
		const json = parseStrictJson(bytes.toString('utf8').replace(/^\uFEFF/, ''));
		if (!json.ok) return {problem: `${printable(file)}: ${json.problem}; left untouched`};
		const parsed = parseProfile(json.value);
		if (!parsed.ok) return {problem: `${printable(file)}: no longer a valid profile (${parsed.errors[0]}); left untouched`};
		return {profile: parsed.value, file, identity: identity!};
	}

	list(): ProfileListing {
		if (!this.#folderExists(false)) return {profiles: [], problems: []};
		const profiles: ScannerProfile[] = [];
		const problems: string[] = [];
		for (const entry of readdirSync(this.folder).sort()) {
			if (isTempName(entry) || !entry.endsWith('.json')) continue;
			const r = this.#read(join(this.folder, entry));
			if ('problem' in r) problems.push(r.problem);
			else profiles.push(r.profile);
		}
		return {profiles, problems};
	}

	#folderExists(create: boolean): boolean {
		try {
			const exists = checkOwnedFolder(this.home, {create}) && checkOwnedFolder(this.folder, {create});
			if (exists && create) sweepTemps(this.folder);
			return exists;
		} catch (error) {
			if (error instanceof FileRefusedError) throw new ScannerStoreError(error.message);
			throw error;
		}
	}

	#fileOf(id: string): string {
		return join(this.folder, `${id}.json`);
	}

	#find(idOrName: string): StoredProfile {
		const {id} = checkProfileName(idOrName, 'profile');
		if (this.#folderExists(false)) {
			const r = this.#read(this.#fileOf(id));
			if (!('problem' in r)) return r;
			if (!r.problem.includes('no such file')) throw new ScannerStoreError(r.problem);
		}
		throw new ScannerStoreError(`no scanner profile "${printable(idOrName)}" (evenecho scanner list shows them)`);
	}

	get(idOrName: string): ScannerProfile {
		return this.#find(idOrName).profile;
	}

	/** Stores a profile under its id; refuses to replace one unless `replace`. */
	save(profile: ScannerProfile, options: {replace: boolean}): void {
		this.#folderExists(true);
		const stamped = {...profile, savedAt: new Date().toISOString()};
		try {
			writeFileAtomic(this.#fileOf(profile.id), `${JSON.stringify(stamped, null, '\t')}\n`, {replace: options.replace});
		} catch (error) {
			if (error instanceof FileRefusedError && error.code === 'exists') {
				throw new ScannerStoreError(`a scanner profile "${profile.id}" already exists; use --force to replace it, or --name to choose another name`);
			}
			if (error instanceof FileRefusedError) throw new ScannerStoreError(error.message);
			throw error;
		}
	}

	delete(idOrName: string): ScannerProfile {
		const found = this.#find(idOrName);
		const outcome = removeIfUnchanged(found.file, found.identity);
		if (outcome === 'changed') throw new ScannerStoreError(`the profile "${found.profile.id}" changed while being deleted (another save?); nothing was deleted`);
		return found.profile;
	}

	/** New name (and so new id); the old file goes only once the new one is safely written. */
	rename(idOrName: string, newName: string, options: {replace: boolean}): ScannerProfile {
		const found = this.#find(idOrName);
		const {name, id} = checkProfileName(newName);
		const renamed = {...found.profile, id, name};
		if (id === found.profile.id) {
			this.save(renamed, {replace: true});
			return renamed;
		}
		this.save(renamed, options);
		removeIfUnchanged(found.file, found.identity);
		return renamed;
	}

	/** A bundle of the chosen profiles (all when none are named). */
	exportBundle(ids: readonly string[]): string {
		const profiles = ids.length ? ids.map((id) => this.get(id)) : this.list().profiles;
		return `${JSON.stringify({format: profileBundleFormat, exportedAt: new Date().toISOString(), profiles}, null, '\t')}\n`;
	}

	/**
	 * Imports one profile file or a bundle. Everything is checked before anything is written; a
	 * profile that exists is refused unless `replace`, and then nothing at all is written.
	 */
	importText(text: string, source: string, options: {replace: boolean}): ScannerProfile[] {
		const json = parseStrictJson(text.replace(/^\uFEFF/, ''));
		if (!json.ok) throw new ScannerStoreError(`${printable(source)}: ${json.problem}; nothing was imported`);
		const value = json.value as {format?: unknown; profiles?: unknown};
		let items: unknown[];
		if (value && typeof value === 'object' && value.format === profileBundleFormat) {
			if (!Array.isArray(value.profiles) || value.profiles.length > maxBundleProfiles) {
				throw new ScannerStoreError(`${printable(source)}: profiles must be a list of at most ${maxBundleProfiles}; nothing was imported`);
			}
			items = value.profiles;
		} else if (value && typeof value === 'object' && value.format === profileFormat) {
			items = [value];
		} else {
			throw new ScannerStoreError(`${printable(source)}: format must be "${profileFormat}" or "${profileBundleFormat}"; nothing was imported`);
		}
		const problems: string[] = [];
		const profiles: ScannerProfile[] = [];
		items.forEach((item, i) => {
			const parsed = parseProfile(item);
			if (!parsed.ok) problems.push(...parsed.errors.map((e) => `profiles.${i}.${e}`));
			else if (checkProfileName(parsed.value.name, `profiles.${i}.name`).id !== parsed.value.id) problems.push(`profiles.${i}.id: must be the file-name form of its name`);
			else profiles.push(parsed.value);
		});
		if (problems.length) throw new ScannerStoreError(`${printable(source)}: not valid scanner profiles; nothing was imported`, problems.slice(0, 20));
		const ids = profiles.map((p) => p.id);
		const twice = ids.find((id, i) => ids.indexOf(id) !== i);
		if (twice) throw new ScannerStoreError(`${printable(source)}: the profile "${twice}" appears twice; nothing was imported`);
		if (!options.replace) {
			const taken = new Set(this.list().profiles.map((p) => p.id));
			const clash = ids.filter((id) => taken.has(id));
			if (clash.length) throw new ScannerStoreError(`${printable(source)}: ${clash.map((c) => `"${c}"`).join(', ')} already exist${clash.length > 1 ? '' : 's'}; use --force to replace; nothing was imported`);
		}
		for (const p of profiles) this.save(p, options);
		return profiles;
	}
}
