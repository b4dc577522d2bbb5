/** The store's folders must be real folders of the user's own; exports take a free name. */
import {lstatSync, mkdirSync, readdirSync, readFileSync, statSync, symlinkSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {writeNewFiles} from '../../src/files/new-file.js';
import {checkOwnedFolder} from '../../src/files/owned-folder.js';
import {cleanTempHomes, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

describe('checkOwnedFolder', () => {
	it('creates a missing folder private to the user', () => {
		const dir = join(tempHome(), 'presets');
		expect(checkOwnedFolder(dir, {create: true})).toBe(true);
		expect(statSync(dir).mode & 0o777).toBe(0o700);
	});

	it('a symbolic link in the folder\'s place is refused, not followed', () => {
		const root = tempHome();
		const elsewhere = join(tempHome(), 'elsewhere');
		mkdirSync(elsewhere);
		symlinkSync(elsewhere, join(root, 'presets'));
		expect(() => checkOwnedFolder(join(root, 'presets'), {create: true})).toThrow(/symbolic link, not a real folder/);
		expect(readdirSync(elsewhere)).toEqual([]);
	});

	it('a file in the folder\'s place is refused', () => {
		const root = tempHome();
		writeFileSync(join(root, 'presets'), '');
		expect(() => checkOwnedFolder(join(root, 'presets'), {create: false})).toThrow(/a regular file, not a real folder/);
	});

	it('a folder of another user is refused (checked against /, owned by root)', () => {
		if (process.getuid?.() === 0) return; // Running as root: every folder is "ours".
		expect(() => checkOwnedFolder('/', {create: false})).toThrow(/belongs to another user/);
	});
});

describe('writeNewFiles', () => {
	it('never replaces: a second export takes the next number, the first stays as it was', () => {
		const dir = tempHome();
		expect(writeNewFiles(dir, 'liver', [['.plan.json', 'one'], ['.summary.txt', 'one']])).toEqual(['liver.plan.json', 'liver.summary.txt']);
		expect(writeNewFiles(dir, 'liver', [['.plan.json', 'two'], ['.summary.txt', 'two']])).toEqual(['liver-2.plan.json', 'liver-2.summary.txt']);
		expect(readFileSync(join(dir, 'liver.plan.json'), 'utf8')).toBe('one');
	});

	it('passes over a planted link and writes nothing through it', () => {
		const dir = tempHome();
		const victim = join(tempHome(), 'victim');
		writeFileSync(victim, 'keep');
		symlinkSync(victim, join(dir, 'liver.summary.txt'));
		expect(writeNewFiles(dir, 'liver', [['.plan.json', 'x'], ['.summary.txt', 'y']])).toEqual(['liver-2.plan.json', 'liver-2.summary.txt']);
		expect(readFileSync(victim, 'utf8')).toBe('keep');
		expect(lstatSync(join(dir, 'liver.summary.txt')).isSymbolicLink()).toBe(true);
		expect(readdirSync(dir).sort()).toEqual(['liver-2.plan.json', 'liver-2.summary.txt', 'liver.summary.txt']);
	});
});
