/**
 * Carries out the scanner panel's effects: list the stored profiles, measure a session, keep a
 * measurement. Measuring takes a moment, so it runs through `later` (after the "measuring…"
 * frame is on screen); its outcome comes back as result actions.
 */
import type {Action} from '../state/console-reducer.js';
import type {ScannerEffect} from '../state/scanner-state.js';
import type {ScannerServices} from './scanner-services.js';

const messageOf = (e: unknown) => (e instanceof Error ? e.message : String(e));

export function runScannerEffect(
	effect: ScannerEffect,
	scanners: ScannerServices,
	later: (work: () => Promise<Action[]>) => void,
): Action[] {
	switch (effect.kind) {
		case 'scanner-list':
			return [{type: 'scanner-profiles', ...scanners.list()}];
		case 'scanner-measure': {
			const images = scanners.folderImages(effect.path);
			if (images) return [{type: 'scanner-folder', folder: effect.path, images}];
			later(async () => {
				try {
					return [{type: 'scanner-measured', path: effect.path, ...(await scanners.measure(effect.path))}];
				} catch (error) {
					return [{type: 'scanner-refused', message: messageOf(error)}];
				}
			});
			return [];
		}
		case 'scanner-measure-built':
			later(async () => {
				try {
					return [
						{
							type: 'scanner-measured',
							path: effect.folder,
							...(await scanners.measureBuilt(effect.folder, effect.session)),
						},
					];
				} catch (error) {
					return [{type: 'scanner-refused', message: messageOf(error)}];
				}
			});
			return [];
		case 'scanner-keep':
			try {
				const kept = scanners.keep(effect.cal, effect.replace, effect.name);
				return [{type: 'scanner-profiles', ...scanners.list(), kept}];
			} catch (error) {
				return [{type: 'scanner-refused', message: `Not kept: ${messageOf(error)}`}];
			}
	}
}
