/**
 * Reads one image file whole, refusing anything that is not a regular file (a FIFO, a device, a
 * folder) and anything over the size cap, before reading a byte of it. The open is non-blocking so
 * a FIFO cannot hang the reader.
 */
import {closeSync, constants, fstatSync, openSync, readSync} from 'node:fs';
import {ImageRefusal, imageLimits} from './image-refusal.js';

export function readImageBytes(path: string, label = path, maxBytes: number = imageLimits.maxFileBytes): Uint8Array {
	let fd: number;
	try {
		fd = openSync(path, constants.O_RDONLY | constants.O_NONBLOCK);
	} catch (error) {
		const code = (error as NodeJS.ErrnoException).code;
		const problem = code === 'ENOENT' ? 'no such file' : `cannot be read (${code ?? 'error'})`;
		throw new ImageRefusal(label, problem);
	}
	try {
		const stat = fstatSync(fd);
		if (!stat.isFile()) throw new ImageRefusal(label, 'is not a regular file; give a DICOM or PNG image file');
		if (stat.size > maxBytes) {
			throw new ImageRefusal(label, `is ${stat.size} bytes; the limit for one image is ${maxBytes} bytes (64 MB)`);
		}
		const bytes = new Uint8Array(stat.size);
		let read = 0;
		while (read < stat.size) {
			const n = readSync(fd, bytes, read, stat.size - read, read);
			if (n === 0) break;
			read += n;
		}
		return read === stat.size ? bytes : bytes.subarray(0, read);
	} finally {
		closeSync(fd);
	}
}
