/**
 * The measured-scanner panel (key `g`) as plain data: the profile list, the session path being
 * typed, or a measurement being paged through before it is kept. Its effects (reading the store
 * and the images) and their results are typed here too. Pure; no React or Ink here.
 */
import type {ScannerProfile} from '../../calibration/profile-document.js';
import type {CalibrationInput, ScannerCalibration} from '../../calibration/scanner-calibration.js';
import type {ScannerSession} from '../../calibration/session-schema.js';
import type {BuiltImage} from './session-builder.js';
import type {TextEntry} from './text-entry.js';

/** The name being typed for a measurement about to be kept; `replace` when opened with S. */
export interface KeepNaming extends TextEntry {
	readonly replace: boolean;
	readonly error?: string;
}

/** The pages of a measurement, in the order they are shown before keeping it. */
export const measurePages = ['images', 'grey', 'depth', 'noise'] as const;
export type MeasurePage = (typeof measurePages)[number];

export type ScannerPanel =
	| {readonly kind: 'list'; readonly cursor: number}
	| {readonly kind: 'path'; readonly text: string; readonly error?: string}
	| {readonly kind: 'measuring'; readonly path: string}
	| {
			readonly kind: 'build';
			readonly folder: string;
			readonly images: readonly BuiltImage[];
			/** Row under the cursor: an image, the depth-scale line (PNG folders), or the last row (measure these). */
			readonly cursor: number;
			/** The folder's depth-scale line (cm per pixel, top row cm) when it holds PNG images. */
			readonly scale?: string;
			/** The line being typed for the image under the cursor, or null. */
			readonly typing: string | null;
			readonly error?: string;
	  }
	| {
			readonly kind: 'result';
			readonly path: string;
			readonly input: CalibrationInput;
			readonly cal: ScannerCalibration;
			readonly page: number;
			readonly message?: string;
			/** While typing the profile's name (s, or S to replace one of that name). */
			readonly naming?: KeepNaming;
			/** The last name typed, offered again after a refusal. */
			readonly name?: string;
	  };

export interface ScannerOverlay {
	readonly kind: 'scanner';
	readonly panel: ScannerPanel;
	/** Stored profiles; null until the store has been read. */
	readonly profiles: readonly ScannerProfile[] | null;
	readonly problems: readonly string[];
	/** While a built session is measured: the builder, to go back to if it is refused. */
	readonly built?: ScannerPanel & {readonly kind: 'build'};
}

export type ScannerEffect =
	| {readonly kind: 'scanner-list'}
	| {readonly kind: 'scanner-measure'; readonly path: string}
	| {readonly kind: 'scanner-keep'; readonly cal: ScannerCalibration; readonly replace: boolean; readonly name: string}
	| {readonly kind: 'scanner-measure-built'; readonly folder: string; readonly session: ScannerSession};

export type ScannerAction =
	| {
			readonly type: 'scanner-profiles';
			readonly profiles: readonly ScannerProfile[];
			readonly problems: readonly string[];
			readonly kept?: string;
	  }
	| {
			readonly type: 'scanner-measured';
			readonly path: string;
			readonly input: CalibrationInput;
			readonly cal: ScannerCalibration;
	  }
	| {readonly type: 'scanner-refused'; readonly message: string}
	/** The typed path is a folder: its images, for building a session in the console. */
	| {readonly type: 'scanner-folder'; readonly folder: string; readonly images: readonly string[]};
