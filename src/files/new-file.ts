/**
 * Writing a new file under a free name: `<stem><suffix>`, else `<stem>-2<suffix>`, `-3`, … The
 * console's exports use it, so exporting twice never replaces the first export silently and a
 * planted link or device under the name is passed over, never written through.
 */
import {join} from 'node:path';
import {commitStaged, removeQuietly, stageFile} from './atomic-write.js';
import {FileRefusedError} from './file-errors.js';
import {printable} from './printable.js';

/** More numbered names than anyone exports by hand; past this the folder is refused as full of them. */
const maxTries = 999;

/**
 * Writes each `[suffix, data]` in `dir` under the first stem number whose names are all free.
 * @returns the file names written, in order.
 */
export function writeNewFiles(dir: string, stem: string, files: readonly (readonly [string, string | Uint8Array])[]): string[] {
	for (let n = 1; n <= maxTries; n++) {
		const numbered = n === 1 ? stem : `${stem}-${n}`;
		const names = files.map(([suffix]) => `${numbered}${suffix}`);
		const written: string[] = [];
		try {
			files.forEach(([, data], i) => {
				commitStaged(stageFile(join(dir, names[i]!), data), {replace: false});
				written.push(names[i]!);
			});
			return names;
		} catch (error) {
			const taken = error instanceof FileRefusedError && (error.code === 'exists' || error.code === 'not-regular' || error.code === 'symbolic-link');
			// Our own files of this round go; anything that was already there stays untouched.
			for (const name of written) removeQuietly(join(dir, name));
			if (!taken) throw error;
		}
	}
	throw new FileRefusedError('exists', `${printable(dir)}: ${printable(stem)} and ${maxTries - 1} numbered names after it are taken; export to another folder`);
}
