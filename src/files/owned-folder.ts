/**
 * The store's own folders must be real folders belonging to the user: a symbolic link, a file, or
 * a folder owned by someone else in their place would let writes land outside the store, or let
 * another account plant files the store then trusts.
 */
import {lstatSync, mkdirSync} from 'node:fs';
import {FileRefusedError, errnoOf} from './file-errors.js';
import {describeKind} from './file-kind.js';
import {printable} from './printable.js';

/**
 * Checks (and, with `create`, makes, private to the user) a folder.
 * @returns false when it does not exist and `create` is not set.
 * @throws FileRefusedError when the entry is not a real folder owned by this user.
 */
export function checkOwnedFolder(path: string, options: {create: boolean}): boolean {
	if (options.create) {
		try {
			mkdirSync(path, {recursive: true, mode: 0o700});
		} catch (error) {
			if (errnoOf(error) !== 'EEXIST') {
				throw new FileRefusedError(
					'unwritable',
					`cannot create the folder ${printable(path)} (${errnoOf(error) ?? 'error'})`,
					errnoOf(error),
				);
			}
		}
	}
	let stat;
	try {
		stat = lstatSync(path);
	} catch (error) {
		if (errnoOf(error) === 'ENOENT') return false;
		throw new FileRefusedError(
			'unreadable',
			`cannot use the folder ${printable(path)} (${errnoOf(error) ?? 'error'})`,
			errnoOf(error),
		);
	}
	if (!stat.isDirectory()) {
		throw new FileRefusedError(
			stat.isSymbolicLink() ? 'symbolic-link' : 'not-regular',
			`${printable(path)} is ${describeKind(stat)}, not a real folder; evenecho does not ` +
				'follow links or write through them here. Move it away (or point EVENECHO_HOME at a ' +
				'folder of your own)',
		);
	}
	const uid = process.getuid?.();
	if (uid !== undefined && stat.uid !== uid) {
		throw new FileRefusedError(
			'not-owned',
			`${printable(path)} belongs to another user (uid ${stat.uid}); evenecho keeps its store only in folders of your own`,
		);
	}
	return true;
}
