/**
 * The one bounded reader: only regular files are opened (FIFOs and devices are refused before any
 * open, so nothing can block), every read is capped, and store reads do not follow links.
 */
import {execFileSync} from 'node:child_process';
import {symlinkSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {readRegularFile} from '../../src/files/bounded-read.js';
import {FileRefusedError} from '../../src/files/file-errors.js';
import {cleanTempHomes, tempHome} from '../helpers/temp-home.js';
import {thrown} from '../helpers/thrown.js';

cleanTempHomes();

const refusal = (work: () => unknown) => thrown(FileRefusedError, work);

describe('readRegularFile', () => {
	it('reads a file and reports who it was (inode, size, SHA-256)', () => {
		const file = join(tempHome(), 'plan.json');
		writeFileSync(file, 'abc');
		const read = readRegularFile(file, {maxBytes: 10});
		expect(read.bytes.toString()).toBe('abc');
		// SHA-256("abc"), FIPS 180-2 appendix B.1 example.
		expect(read.identity?.sha256).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
		expect(read.identity?.size).toBe(3);
	});

	it('a FIFO is refused before it is opened: returns at once instead of waiting for a writer', () => {
		const fifo = join(tempHome(), 'plan.json');
		execFileSync('mkfifo', [fifo]);
		const error = refusal(() => readRegularFile(fifo, {maxBytes: 1000, what: 'plan'}));
		expect(error.code).toBe('not-regular');
		expect(error.message).toContain('a named pipe (FIFO), not a regular file');
	});

	it('/dev/zero is refused as a device, not read until memory runs out', () => {
		const error = refusal(() => readRegularFile('/dev/zero', {maxBytes: 1000}));
		expect(error.code).toBe('not-regular');
		expect(error.message).toContain('a character device');
	});

	it('a file one byte over the cap is refused; one at the cap is read', () => {
		const dir = tempHome();
		writeFileSync(join(dir, 'at.json'), 'x'.repeat(100));
		writeFileSync(join(dir, 'over.json'), 'x'.repeat(101));
		expect(readRegularFile(join(dir, 'at.json'), {maxBytes: 100}).bytes.length).toBe(100);
		expect(refusal(() => readRegularFile(join(dir, 'over.json'), {maxBytes: 100})).code).toBe('too-large');
	});

	it('a symbolic link is followed only when allowed (files the user names), never inside the store', () => {
		const dir = tempHome();
		writeFileSync(join(dir, 'real.json'), '{}');
		symlinkSync(join(dir, 'real.json'), join(dir, 'link.json'));
		expect(readRegularFile(join(dir, 'link.json'), {maxBytes: 10}).bytes.toString()).toBe('{}');
		expect(refusal(() => readRegularFile(join(dir, 'link.json'), {maxBytes: 10, followLinks: false})).code).toBe(
			'symbolic-link',
		);
	});

	it('a missing file says so, printably', () => {
		const error = refusal(() => readRegularFile(join(tempHome(), 'no\u001b[2J.json'), {maxBytes: 10}));
		expect(error.code).toBe('not-found');
		expect(error.message).not.toContain('\u001b');
		expect(error.message).toContain('\\u001b[2J');
	});
});
