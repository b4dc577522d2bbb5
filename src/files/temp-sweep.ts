/**
 * Sweeps what a crash can leave in a folder this program writes to: temporary files from the
 * atomic writer (removed) and files held aside by a guarded change (put back under their name,
 * unless a newer file has it). Only entries old enough that no live write can still own them are
 * touched, and a time in the future (a clock that was wrong, a copied folder) counts as stale too.
 */
import {lstatSync, readdirSync} from 'node:fs';
import {join} from 'node:path';
import {isTempName, removeQuietly, tempSuffix} from './atomic-write.js';
import {heldTag, putBack} from './guarded-change.js';

/** No write of ours takes anywhere near this long. */
export const staleAfterMs = 60 * 60 * 1000;

/** The target a held file belongs to: `.<name>.held.<random>.tmp` → `<name>`. */
function heldTarget(fileName: string): string | undefined {
	const match = new RegExp(`^\\.(.+)\\.${heldTag}\\.[0-9a-f]{24}${tempSuffix.replace('.', '\\.')}$`).exec(fileName);
	return match?.[1];
}

export function isStale(mtimeMs: number, now: number): boolean {
	return Math.abs(now - mtimeMs) > staleAfterMs;
}

/** Sweeps `dir`; returns what it put back, for notices. Never throws. */
export function sweepTemps(dir: string, now = Date.now()): string[] {
	const restored: string[] = [];
	let names: string[];
	try {
		names = readdirSync(dir);
	} catch {
		return restored;
	}
	for (const name of names) {
		if (!isTempName(name)) continue;
		const path = join(dir, name);
		try {
			if (!isStale(lstatSync(path).mtimeMs, now)) continue;
		} catch {
			continue; // Another process committed or swept it.
		}
		const target = heldTarget(name);
		if (target) {
			putBack(path, join(dir, target));
			restored.push(target);
		} else {
			removeQuietly(path);
		}
	}
	return restored;
}
