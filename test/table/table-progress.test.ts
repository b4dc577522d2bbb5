/** The sweep progress bar: terminal only, silent for short sweeps, throttled, erased when done. */
import {describe, expect, it} from 'vitest';
import {createProgressBar, type ProgressStream} from '../../src/table/progress-bar.js';

function fakeStream(isTTY: boolean, columns = 80): ProgressStream & {out: string[]} {
	const out: string[] = [];
	return {isTTY, columns, out, write: (t: string) => out.push(t)};
}

function clock() {
	let t = 0;
	return {now: () => t, advance: (ms: number) => (t += ms)};
}

describe('progress bar', () => {
	it('writes nothing when the stream is not a terminal (piped or redirected)', () => {
		const s = fakeStream(false);
		const c = clock();
		const bar = createProgressBar(s, {now: c.now});
		for (let i = 1; i <= 100; i++) {
			c.advance(100);
			bar.update(i, 100);
		}
		bar.finish();
		expect(s.out).toEqual([]);
	});

	it('stays silent for the first second, so short sweeps show nothing', () => {
		const s = fakeStream(true);
		const c = clock();
		const bar = createProgressBar(s, {now: c.now});
		for (let i = 1; i <= 9; i++) {
			c.advance(100);
			bar.update(i, 10);
		}
		bar.finish();
		expect(s.out).toEqual([]);
	});

	it('after a second draws one line with a carriage return, at most every 100 ms, and erases it at the end', () => {
		const s = fakeStream(true, 60);
		const c = clock();
		const bar = createProgressBar(s, {now: c.now, label: 'rows'});
		c.advance(1000);
		bar.update(250, 1000);
		expect(s.out).toHaveLength(1);
		expect(s.out[0]).toMatch(/^\r\[#+\.+\] rows 250\/1000 +25 %$/);
		expect(s.out[0]!.length - 1).toBeLessThanOrEqual(60);
		c.advance(50);
		bar.update(260, 1000);
		expect(s.out).toHaveLength(1);
		c.advance(60);
		bar.update(270, 1000);
		expect(s.out).toHaveLength(2);
		expect(bar.drawn).toBe(true);
		bar.update(1000, 1000);
		expect(s.out.at(-1)).toContain('1000/1000 100 %');
		bar.finish();
		expect(s.out.at(-1)).toBe('\r\u001b[2K');
		expect(bar.drawn).toBe(false);
	});
});
