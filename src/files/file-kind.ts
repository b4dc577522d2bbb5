/** Plain words for what a directory entry is, for messages that refuse anything but a regular file. */
import type {Stats} from 'node:fs';

export function describeKind(stat: Stats): string {
	if (stat.isFile()) return 'a regular file';
	if (stat.isDirectory()) return 'a folder';
	if (stat.isSymbolicLink()) return 'a symbolic link';
	if (stat.isFIFO()) return 'a named pipe (FIFO)';
	if (stat.isCharacterDevice()) return 'a character device';
	if (stat.isBlockDevice()) return 'a block device';
	if (stat.isSocket()) return 'a socket';
	return 'not a regular file';
}
