/**
 * The one atomic writer: never through a link (at the temporary name or the target), never over a
 * special file, never replacing without leave, keeping the replaced file's permission bits, and
 * leaving no temporary file behind.
 */
import {execFileSync} from 'node:child_process';
import {
	chmodSync,
	lstatSync,
	mkdirSync,
	readdirSync,
	readFileSync,
	statSync,
	symlinkSync,
	writeFileSync,
} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {commitStaged, isTempName, stageFile, tempPathFor, writeFileAtomic} from '../../src/files/atomic-write.js';
import {FileRefusedError} from '../../src/files/file-errors.js';
import {cleanTempHomes, tempHome} from '../helpers/temp-home.js';
import {thrown} from '../helpers/thrown.js';

cleanTempHomes();

const refusal = (work: () => unknown) => thrown(FileRefusedError, work);

/** A folder to write in and a file elsewhere that must never change. */
function scene() {
	const root = tempHome();
	const dir = join(root, 'out');
	mkdirSync(dir);
	const victim = join(root, 'victim.txt');
	writeFileSync(victim, 'keep me\n');
	return {dir, victim};
}

describe('writeFileAtomic', () => {
	it('writes the whole text and leaves no temporary file', () => {
		const {dir} = scene();
		writeFileAtomic(join(dir, 'a.json'), '{"a": 1}\n', {replace: false});
		expect(readFileSync(join(dir, 'a.json'), 'utf8')).toBe('{"a": 1}\n');
		expect(readdirSync(dir)).toEqual(['a.json']);
	});

	it('a symbolic link at the target is refused, with or without leave to replace; the linked file is untouched', () => {
		const {dir, victim} = scene();
		const target = join(dir, 'export.json');
		symlinkSync(victim, target);
		expect(refusal(() => writeFileAtomic(target, 'evil', {replace: true})).code).toBe('symbolic-link');
		expect(refusal(() => writeFileAtomic(target, 'evil', {replace: false})).code).toBe('symbolic-link');
		expect(readFileSync(victim, 'utf8')).toBe('keep me\n');
		expect(lstatSync(target).isSymbolicLink()).toBe(true);
		expect(readdirSync(dir)).toEqual(['export.json']);
	});

	it('a dangling symbolic link at the target is refused too (it would create a file elsewhere)', () => {
		const {dir} = scene();
		const elsewhere = join(tempHome(), 'created-elsewhere.txt');
		const target = join(dir, 'export.json');
		symlinkSync(elsewhere, target);
		refusal(() => writeFileAtomic(target, 'evil', {replace: true}));
		expect(() => statSync(elsewhere)).toThrow();
	});

	it('a link planted at the temporary name makes the write fail; nothing is written through it', () => {
		const {dir, victim} = scene();
		const target = join(dir, 'export.json');
		const temp = tempPathFor(target);
		symlinkSync(victim, temp);
		const error = refusal(() => stageFile(target, 'evil', {temp}));
		expect(error.code).toBe('unwritable');
		expect(error.errno).toBe('EEXIST');
		expect(readFileSync(victim, 'utf8')).toBe('keep me\n');
	});

	it('temporary names are unpredictable (96 random bits) and recognisable for the sweep', () => {
		const a = tempPathFor('/x/plan.json');
		const b = tempPathFor('/x/plan.json');
		expect(a).not.toBe(b);
		expect(a).toMatch(/\/\.plan\.json\.[0-9a-f]{24}\.tmp$/);
		expect(isTempName(a.slice(3))).toBe(true);
		expect(a).not.toContain(String(process.pid));
	});

	it('a FIFO at the target is refused and stays a FIFO', () => {
		const {dir} = scene();
		const fifo = join(dir, 'bundle.json');
		execFileSync('mkfifo', [fifo]);
		expect(refusal(() => writeFileAtomic(fifo, 'x', {replace: true})).code).toBe('not-regular');
		expect(lstatSync(fifo).isFIFO()).toBe(true);
		expect(readdirSync(dir)).toEqual(['bundle.json']);
	});

	it('a device node at the target is refused (the message names what it is)', () => {
		const error = refusal(() => writeFileAtomic('/dev/null', 'x', {replace: true}));
		expect(error.code).toBe('not-regular');
		expect(error.message).toContain('a character device');
		expect(lstatSync('/dev/null').isCharacterDevice()).toBe(true);
	});

	it('a folder at the target is refused', () => {
		const {dir} = scene();
		mkdirSync(join(dir, 'plan.json'));
		expect(refusal(() => writeFileAtomic(join(dir, 'plan.json'), 'x', {replace: true})).code).toBe('not-regular');
	});

	it('without leave to replace, an existing file is refused and kept as it was', () => {
		const {dir} = scene();
		const target = join(dir, 'a.json');
		writeFileSync(target, 'first');
		const error = refusal(() => writeFileAtomic(target, 'second', {replace: false}));
		expect(error.code).toBe('exists');
		expect(readFileSync(target, 'utf8')).toBe('first');
		expect(readdirSync(dir)).toEqual(['a.json']);
	});

	it('a replaced file keeps its permission bits (not widened)', () => {
		const {dir} = scene();
		const target = join(dir, 'settings.json');
		writeFileSync(target, '{}');
		chmodSync(target, 0o600);
		writeFileAtomic(target, '{"a": 1}', {replace: true});
		expect(statSync(target).mode & 0o777).toBe(0o600);
		expect(readFileSync(target, 'utf8')).toBe('{"a": 1}');
	});

	it('two exclusive commits of the same name: exactly one wins', () => {
		const {dir} = scene();
		const target = join(dir, 'same.json');
		const first = stageFile(target, 'one');
		const second = stageFile(target, 'two');
		commitStaged(first, {replace: false});
		expect(refusal(() => commitStaged(second, {replace: false})).code).toBe('exists');
		expect(readFileSync(target, 'utf8')).toBe('one');
		expect(readdirSync(dir)).toEqual(['same.json']);
	});
});
