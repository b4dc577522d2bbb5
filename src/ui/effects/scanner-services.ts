/**
 * The profile store and the image reader as the console's scanner panel sees them. Calls only the
 * store's public functions. Nothing here lets a bad file or a store failure reach the screen as a
 * stack trace: refusals come back as errors whose message names the field, for the panel to show.
 */
import {readdirSync, statSync} from 'node:fs';
import {homedir} from 'node:os';
import {profileFromCalibration, scannerResponseOf, type ScannerProfile} from '../../calibration/profile-document.js';
import type {CalibrationInput, ScannerCalibration} from '../../calibration/scanner-calibration.js';
import type {ScannerSession} from '../../calibration/session-schema.js';
import {printable} from '../../files/printable.js';
import type {PlanScanner} from '../../plan/resolve-plan.js';
import {isBuilderImage} from '../state/session-builder.js';
import {
	checkProfileName,
	openScannerProfileStore,
	type ScannerProfileStore,
} from '../../store/scanner-profile-store.js';

export interface ScannerServices {
	list(): {readonly profiles: readonly ScannerProfile[]; readonly problems: readonly string[]};
	/** What the plan takes from the profile it names; a problem (no such profile) instead when it cannot. */
	lookup(id: string): {readonly scanner: PlanScanner} | {readonly problem: string};
	/** Reads a session file and its images and measures them; throws with a message naming the field. */
	measure(path: string): Promise<{readonly input: CalibrationInput; readonly cal: ScannerCalibration}>;
	/** The DICOM images of a folder (sorted), or null when the path is not a folder. */
	folderImages(path: string): readonly string[] | null;
	/** Measures a session built in the console from a folder's images. */
	measureBuilt(
		folder: string,
		session: ScannerSession,
	): Promise<{readonly input: CalibrationInput; readonly cal: ScannerCalibration}>;
	/** Stores the measurement under `name` (default its label); returns the profile id. Throws when taken and not `replace`. */
	keep(cal: ScannerCalibration, replace: boolean, name?: string): string;
}

const messageOf = (e: unknown) => printable(e instanceof Error ? e.message : String(e));

/** `~/…` as a shell would read it; everything else as typed (relative to the current folder). */
export function expandHome(path: string): string {
	return path === '~' ? homedir() : path.startsWith('~/') ? `${homedir()}${path.slice(1)}` : path;
}

export function scannerServicesOver(open: () => ScannerProfileStore): ScannerServices {
	return {
		list() {
			try {
				return open().list();
			} catch (error) {
				return {profiles: [], problems: [`scanner profiles could not be listed: ${messageOf(error)}`]};
			}
		},
		lookup(id) {
			try {
				return {scanner: scannerResponseOf(open().get(id))};
			} catch (error) {
				return {
					problem: `scanner: ${messageOf(error)}; the curve uses the assumed built-in ramp until it is found or changed (g)`,
				};
			}
		},
		async measure(path) {
			try {
				// The image readers and the fit load only when first used, not with the console.
				const [{loadSession}, {calibrateScanner}] = await Promise.all([
					import('../../image/load-session.js'),
					import('../../calibration/scanner-calibration.js'),
				]);
				const {input} = loadSession(expandHome(path));
				return {input, cal: calibrateScanner(input)};
			} catch (error) {
				throw new Error(messageOf(error));
			}
		},
		folderImages(path) {
			const folder = expandHome(path);
			try {
				if (!statSync(folder).isDirectory()) return null;
				return readdirSync(folder).filter(isBuilderImage).sort();
			} catch {
				return null;
			}
		},
		async measureBuilt(folder, session) {
			try {
				const [{loadSessionImages}, {calibrateScanner}] = await Promise.all([
					import('../../image/load-session.js'),
					import('../../calibration/scanner-calibration.js'),
				]);
				const {input} = loadSessionImages(session, expandHome(folder));
				return {input, cal: calibrateScanner(input)};
			} catch (error) {
				throw new Error(messageOf(error));
			}
		},
		keep(cal, replace, typed) {
			try {
				const {name, id} =
					typed === undefined
						? checkProfileName(cal.label, 'label (the session label names the profile)')
						: checkProfileName(typed, 'name');
				const store = open();
				if (!replace && store.list().profiles.some((p) => p.id === id))
					throw new Error(`a scanner profile "${id}" already exists; S replaces it`);
				store.save(profileFromCalibration(cal, id, name), {replace});
				return id;
			} catch (error) {
				throw new Error(messageOf(error));
			}
		},
	};
}

/** The user's own store (EVENECHO_HOME, else the standard per-user folder), opened on each use. */
export function openScannerServices(): ScannerServices {
	return scannerServicesOver(() => openScannerProfileStore());
}

/** No store at all: nothing listed, nothing kept (the default in tests and the bench). */
export const noScannerServices: ScannerServices = {
	list: () => ({profiles: [], problems: []}),
	lookup: (id) => ({problem: `scanner: no scanner profile "${id}" here; the curve uses the assumed built-in ramp`}),
	measure: () => Promise.reject(new Error('measuring is not available here')),
	keep: () => {
		throw new Error('scanner profiles cannot be kept here');
	},
	folderImages: () => null,
	measureBuilt: () => Promise.reject(new Error('measuring is not available here')),
};
