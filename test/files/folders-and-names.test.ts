/** The store's folders must be real folders of the user's own. */
import {mkdirSync, readdirSync, statSync, symlinkSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {checkOwnedFolder} from '../../src/files/owned-folder.js';
import {cleanTempHomes, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

describe('checkOwnedFolder', () => {
	it('creates a missing folder private to the user', () => {
		const dir = join(tempHome(), 'presets');
		expect(checkOwnedFolder(dir, {create: true})).toBe(true);
		expect(statSync(dir).mode & 0o777).toBe(0o700);
	});

	it("a symbolic link in the folder's place is refused, not followed", () => {
		const root = tempHome();
		const elsewhere = join(tempHome(), 'elsewhere');
		mkdirSync(elsewhere);
		symlinkSync(elsewhere, join(root, 'presets'));
		expect(() => checkOwnedFolder(join(root, 'presets'), {create: true})).toThrow(/symbolic link, not a real folder/);
		expect(readdirSync(elsewhere)).toEqual([]);
	});

	it("a file in the folder's place is refused", () => {
		const root = tempHome();
		writeFileSync(join(root, 'presets'), '');
		expect(() => checkOwnedFolder(join(root, 'presets'), {create: false})).toThrow(/a regular file, not a real folder/);
	});

	it('a folder of another user is refused (checked against /, owned by root)', () => {
		if (process.getuid?.() === 0) return; // Running as root: every folder is "ours".
		expect(() => checkOwnedFolder('/', {create: false})).toThrow(/belongs to another user/);
	});
});
