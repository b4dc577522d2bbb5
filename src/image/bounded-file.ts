/**
 * Reads one image file whole through the shared file layer: only a regular file (checked before a
 * non-blocking open), capped at 64 MB before a byte is read. Refusals become ImageRefusal.
 */
import {readRegularFile} from '../files/bounded-read.js';
import {FileRefusedError} from '../files/file-errors.js';
import {ImageRefusal, imageLimits} from './image-refusal.js';

export function readImageBytes(path: string, label = path, maxBytes: number = imageLimits.maxFileBytes): Uint8Array {
	try {
		// Images are only read, never replaced, so no fingerprint is needed.
		const {bytes} = readRegularFile(path, {maxBytes, what: 'image', withIdentity: false});
		return new Uint8Array(bytes.buffer, bytes.byteOffset, bytes.byteLength);
	} catch (error) {
		if (error instanceof FileRefusedError) {
			// The file layer names the path itself; keep the message, name the image as the session does.
			const problem = error.message.includes(': ')
				? error.message.slice(error.message.indexOf(': ') + 2)
				: error.message;
			throw new ImageRefusal(label, problem);
		}
		throw error;
	}
}
