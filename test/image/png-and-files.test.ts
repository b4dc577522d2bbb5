/** PNG stills and the bounded file reader: caps and special files refused before decoding. */
import {execFileSync} from 'node:child_process';
import {closeSync, mkdirSync, mkdtempSync, openSync, rmSync, writeFileSync, ftruncateSync} from 'node:fs';
import {tmpdir} from 'node:os';
import {join} from 'node:path';
import {encode} from 'fast-png';
import {afterAll, describe, expect, it} from 'vitest';
import {rowDepthCm} from '../../src/calibration/phantom-image.js';
import {ImageRefusal} from '../../src/image/image-refusal.js';
import {decodeImage, readImageFile} from '../../src/image/read-image.js';
import {thrown} from '../helpers/thrown.js';

const dir = mkdtempSync(join(tmpdir(), 'evenecho-image-'));
afterAll(() => rmSync(dir, {recursive: true, force: true}));

const refusal = (fn: () => unknown) => thrown(ImageRefusal, fn).message;

const scale = {cmPerPixel: 0.05, topRowCm: 0.5};

describe('PNG', () => {
	it('8-bit grey with the session pixel scale: row y centre at topRowCm + (y + ½)·cmPerPixel', () => {
		const data = Uint8Array.from({length: 40 * 30}, (_, i) => Math.floor(i / 40) * 8);
		const image = decodeImage(encode({width: 40, height: 30, data, channels: 1, depth: 8}), {pixelScale: scale});
		expect(image.grey[10 * 40 + 3]).toBe(80);
		expect(rowDepthCm(image, 10)).toBeCloseTo(0.5 + 10.5 * 0.05, 10);
		expect(image.region).toEqual({x0: 0, y0: 0, x1: 39, y1: 29});
	});

	it('16-bit grey and RGBA with a coloured label masked', () => {
		const words = Uint16Array.from({length: 8 * 8}, () => 65535);
		expect(
			decodeImage(encode({width: 8, height: 8, data: words, channels: 1, depth: 16}), {pixelScale: scale}).grey[5],
		).toBeCloseTo(255, 4);
		const rgba = new Uint8Array(20 * 20 * 4);
		for (let i = 0; i < 400; i++) rgba.set(i === 210 ? [255, 255, 0, 255] : [90, 90, 90, 255], 4 * i);
		const image = decodeImage(encode({width: 20, height: 20, data: rgba, channels: 4, depth: 8}), {pixelScale: scale});
		expect(image.mask[210]).toBe(1);
		expect(image.mask[212]).toBe(1);
		expect(image.mask[0]).toBe(0);
		expect(image.grey[0]).toBeCloseTo(90, 4);
	});

	it('needs pixelScale, and refuses a size claim over 8192 px from the header alone', () => {
		const png = encode({width: 4, height: 4, data: new Uint8Array(16), channels: 1, depth: 8});
		expect(refusal(() => decodeImage(png, {label: 'a.png'}))).toContain(
			'pixelScale: is needed for the PNG image a.png',
		);
		const huge = png.slice();
		new DataView(huge.buffer).setUint32(16, 9000); // IHDR width; CRC no longer matters, nothing is inflated
		expect(refusal(() => decodeImage(huge, {pixelScale: scale, label: 'big.png'}))).toContain('claims 9000 × 4 pixels');
	});
});

describe('the bounded file reader', () => {
	it('refuses a missing file, a folder and a FIFO without blocking', () => {
		expect(refusal(() => readImageFile(join(dir, 'nope.dcm')))).toContain('no such file');
		mkdirSync(join(dir, 'folder'));
		expect(refusal(() => readImageFile(join(dir, 'folder')))).toContain('not a regular file');
		const fifo = join(dir, 'pipe');
		execFileSync('mkfifo', [fifo]);
		expect(refusal(() => readImageFile(fifo))).toContain('not a regular file');
	});

	it('refuses a file over 64 MB before reading it (a sparse file, so the test stays cheap)', () => {
		const big = join(dir, 'big.dcm');
		writeFileSync(big, '');
		const fd = openSync(big, 'r+');
		ftruncateSync(fd, 64 * 1024 * 1024 + 1);
		closeSync(fd);
		expect(refusal(() => readImageFile(big))).toContain('over the limit of 67,108,864 bytes');
	});
});
