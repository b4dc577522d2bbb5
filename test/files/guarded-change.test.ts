/**
 * Compare-and-swap on delete and replace, made deterministic: a pause point between our read and
 * our change lets the test land a rival save exactly there; the rival save must survive.
 */
import {readdirSync, readFileSync, writeFileSync} from 'node:fs';
import {join} from 'node:path';
import {describe, expect, it} from 'vitest';
import {writeFileAtomic} from '../../src/files/atomic-write.js';
import {readRegularFile} from '../../src/files/bounded-read.js';
import {removeIfUnchanged, replaceIfUnchanged} from '../../src/files/guarded-change.js';
import {cleanTempHomes, tempHome} from '../helpers/temp-home.js';

cleanTempHomes();

function setUp() {
	const dir = tempHome();
	const file = join(dir, 'liver.json');
	writeFileSync(file, 'as read\n');
	return {dir, file, identity: readRegularFile(file, {maxBytes: 100}).identity!};
}

describe('removeIfUnchanged', () => {
	it('deletes the file it read', () => {
		const {dir, file, identity} = setUp();
		expect(removeIfUnchanged(file, identity)).toBe('done');
		expect(readdirSync(dir)).toEqual([]);
	});

	it('a save landing between the read and the delete is kept (before the delete takes the file)', () => {
		const {dir, file, identity} = setUp();
		const outcome = removeIfUnchanged(file, identity, (point) => {
			if (point === 'before-take') writeFileAtomic(file, 'saved meanwhile\n', {replace: true});
		});
		expect(outcome).toBe('changed');
		expect(readFileSync(file, 'utf8')).toBe('saved meanwhile\n');
		expect(readdirSync(dir)).toEqual(['liver.json']);
	});

	it('same content rewritten (a new inode) also counts as a change: it was a save', () => {
		const {file, identity} = setUp();
		const outcome = removeIfUnchanged(file, identity, (point) => {
			if (point === 'before-take') writeFileAtomic(file, 'as read\n', {replace: true});
		});
		expect(outcome).toBe('changed');
		expect(readFileSync(file, 'utf8')).toBe('as read\n');
	});

	it('nothing there: gone', () => {
		const {file, identity} = setUp();
		expect(removeIfUnchanged(`${file}.missing`, identity)).toBe('gone');
	});
});

describe('replaceIfUnchanged', () => {
	it('replaces the file it read', () => {
		const {dir, file, identity} = setUp();
		expect(replaceIfUnchanged(file, 'new\n', identity)).toBe('done');
		expect(readFileSync(file, 'utf8')).toBe('new\n');
		expect(readdirSync(dir)).toEqual(['liver.json']);
	});

	it('a save landing before the swap wins; ours is refused and nothing is left behind', () => {
		const {dir, file, identity} = setUp();
		const outcome = replaceIfUnchanged(file, 'ours\n', identity, (point) => {
			if (point === 'before-take') writeFileAtomic(file, 'theirs\n', {replace: true});
		});
		expect(outcome).toBe('changed');
		expect(readFileSync(file, 'utf8')).toBe('theirs\n');
		expect(readdirSync(dir)).toEqual(['liver.json']);
	});

	it('a save creating the name after our take (while it is free) wins too', () => {
		const {dir, file, identity} = setUp();
		const outcome = replaceIfUnchanged(file, 'ours\n', identity, (point) => {
			if (point === 'after-take') writeFileAtomic(file, 'theirs\n', {replace: false});
		});
		expect(outcome).toBe('changed');
		expect(readFileSync(file, 'utf8')).toBe('theirs\n');
		expect(readdirSync(dir)).toEqual(['liver.json']);
	});
});
