/**
 * The store's folder and its small settings file (`config.json`: the layout and the newest
 * record version written).
 *
 * `conf` decides where the store lives (its standard per-user config folder, `cwd` for tests and
 * shared drives), and only that: its own reader follows links and would block on a FIFO, and its
 * writer writes through a link and widens the file's permissions. So a subclass turns conf's store
 * accessors into no-ops (the constructor then neither reads nor writes), and the settings file is
 * read and written by the file layer: never through a link, only a regular file, mode kept.
 */
import Conf from 'conf';
import {dirname} from 'node:path';
import {writeFileAtomic} from '../files/atomic-write.js';
import {maxPlanBytes, readRegularFile, type FileIdentity} from '../files/bounded-read.js';
import {FileRefusedError} from '../files/file-errors.js';
import {parseJsonBytes} from '../files/json-input.js';

type Settings = Record<string, unknown>;

/** Conf for its folder resolution only: its file accessors do nothing. */
class FolderOnlyConf extends Conf<Settings> {
	override get store(): Settings {
		return {};
	}

	override set store(_value: Settings) {
		// Writing is done by writeSettings, through the file layer.
	}
}

/** Where the settings file lives: `<home>/config.json`, home being conf's choice unless given. */
export function settingsPath(home: string | undefined): string {
	return new FolderOnlyConf({
		projectName: 'evenecho',
		configName: 'config',
		...(home !== undefined ? {cwd: home} : {}),
		clearInvalidConfig: false,
	}).path;
}

export function storeHomeOf(settingsFile: string): string {
	return dirname(settingsFile);
}

/** What reading the settings gave: the object, nothing yet, or a damaged file (with its text). */
export type SettingsRead =
	| {kind: 'ok'; settings: Settings}
	| {kind: 'missing'}
	| {kind: 'damaged'; problem: string; identity: FileIdentity}
	| {kind: 'refused'; problem: string};

function isPlainObject(value: unknown): value is Settings {
	return value !== null && typeof value === 'object' && !Array.isArray(value);
}

export function readSettings(file: string): SettingsRead {
	let read;
	try {
		read = readRegularFile(file, {maxBytes: maxPlanBytes, followLinks: false, what: 'settings file'});
	} catch (error) {
		if (!(error instanceof FileRefusedError)) throw error;
		return error.code === 'not-found' ? {kind: 'missing'} : {kind: 'refused', problem: error.message};
	}
	const identity = read.identity!;
	try {
		const doc = parseJsonBytes(file, read.bytes, identity);
		return isPlainObject(doc.value)
			? {kind: 'ok', settings: doc.value}
			: {kind: 'damaged', problem: 'not a JSON object', identity};
	} catch (error) {
		if (!(error instanceof FileRefusedError)) throw error;
		// The message starts with the path; the notice names the file itself.
		return {kind: 'damaged', problem: error.message.slice(error.message.indexOf(': ') + 2), identity};
	}
}

export function writeSettings(file: string, settings: Settings): void {
	writeFileAtomic(file, `${JSON.stringify(settings, null, '\t')}\n`, {replace: true});
}
