/**
 * The project patches Ink's frame writer (patches/ink+6.8.0.patch, applied by `npm install`): a row
 * of plain lines (no wide or joined characters, every style closed by the line's end) is its lines
 * joined by spaces, with no cell per character; other rows go through Ink's cell grid, with the
 * tokenized lines and finished rows kept from one frame to the next. The patch must not change what
 * a terminal shows: every cell's character and style. Checked against the tokenizer library's own
 * functions on random styled text, frame after frame, with lines kept, changed, moved and
 * overlapping; rows drawn through the grid must match byte for byte.
 */
import {createRequire} from 'node:module';
import {dirname, join} from 'node:path';
import {pathToFileURL} from 'node:url';
import {
	reduceAnsiCodes,
	type StyledChar,
	styledCharsFromTokens,
	styledCharsToString,
	tokenize,
} from '@alcalzone/ansi-tokenize';
import stringWidth from 'string-width';
import widestLine from 'widest-line';
import {describe, expect, it} from 'vitest';
import {mulberry32} from '../../src/simulate/seeded-random.js';

interface InkOutput {
	write(x: number, y: number, text: string, options: {transformers: unknown[]}): void;
	get(): {output: string; height: number};
	caches: {previous?: unknown};
}
type OutputClass = new (size: {width: number; height: number}) => InkOutput;

// Ink's package exports only its entry point; the frame writer is read from its file.
const inkEntry = createRequire(import.meta.url).resolve('ink');
const inkFile = async <T>(name: string): Promise<T> =>
	((await import(pathToFileURL(join(dirname(inkEntry), name)).href)) as {default: T}).default;
const Output = await inkFile<OutputClass>('output.js');
const measureText = await inkFile<(text: string) => {width: number; height: number}>('measure-text.js');

const esc = '\u001B[';
const styles = [
	`${esc}1m`,
	`${esc}2m`,
	`${esc}22m`,
	`${esc}36m`,
	`${esc}39m`,
	`${esc}49m`,
	`${esc}0m`,
	`${esc}38;5;240m`,
	`${esc}48;5;250m`,
	`${esc}38;2;10;200;30m`,
	`${esc}7m`,
	`${esc}27m`,
];
// Plain, box-drawing, half-block, accented, wide (CJK), emoji, combining and joined characters: the
// library tokenizes such lines whole.
const anyCharacters = ['a', 'Z', '0', ' ', ' ', '|', '─', '│', '▀', '░', 'é', '°', '–', '中', '😀', 'e\u0301', '👍🏽'];
// Only characters that are their own grapheme beside anything, as in most of the console's lines:
// the patch tokenizes these piece by piece.
const loneCharacters = ['a', 'Z', '0', ' ', ' ', '|', '─', '│', '▀', '░', 'é', '°', '–', '…', '→', '≤', '−', 'µ'];

function randomLine(random: () => number, width: number, characters: readonly string[]): string {
	let text = '';
	let used = 0;
	while (used < width - 2) {
		if (random() < 0.3) text += styles[Math.floor(random() * styles.length)];
		const c = characters[Math.floor(random() * characters.length)]!;
		used += Math.max(1, stringWidth(c));
		text += c;
	}
	return random() < 0.5 ? `${text}${esc}0m` : text;
}

/** The row Ink 6.8 makes, unpatched: blank cells, each text's characters laid over in turn, wide ones padded. */
function referenceRow(texts: readonly {x: number; text: string}[], width: number): string {
	const blank = (): StyledChar => ({type: 'char', value: ' ', fullWidth: false, styles: []});
	const cells: StyledChar[] = Array.from({length: width}, blank);
	for (const {x, text} of texts) {
		let at = x;
		for (const c of styledCharsFromTokens(tokenize(text))) {
			cells[at] = c;
			const w = Math.max(1, stringWidth(c.value));
			for (let k = 1; k < w; k++) cells[at + k] = {type: 'char', value: '', fullWidth: false, styles: c.styles};
			at += w;
		}
	}
	return styledCharsToString(cells.filter((c) => c !== undefined)).trimEnd();
}

// Written after each line at a fixed column: a character counted into the wrong cells moves it.
const marker = {x: 57, text: `${esc}2m#${esc}22m`};

/** What a terminal shows of a row: each cell's character and the set of styles in force there. */
function cellsShown(row: string): string[] {
	const cells = styledCharsFromTokens(tokenize(row)).map((c) =>
		[
			c.value,
			...reduceAnsiCodes(c.styles)
				.map((s) => s.code)
				.sort(),
		].join('|'),
	);
	// Blank cells with no style at the end of a row are not written at all.
	while (cells.length > 0 && cells[cells.length - 1] === ' ') cells.pop();
	return cells;
}

/** Does a line leave a style open at its end (so the patch draws its row through the cell grid)? */
const leavesStyleOpen = (line: string) => {
	const chars = styledCharsFromTokens(tokenize(`${line}x`));
	return reduceAnsiCodes(chars[chars.length - 1]!.styles).length > 0;
};

describe('the patched Ink frame writer', () => {
	it('is the patched one (npm install applies patches/)', () => {
		const first = new Output({width: 4, height: 1});
		const second = new Output({width: 4, height: 1});
		expect(second.caches.previous).toBe(first.caches);
	});

	it.each([
		['any characters', anyCharacters, 20261202],
		['lone characters', loneCharacters, 7],
	] as const)(
		'shows every cell of every frame as the tokenizer library does (%s), with lines kept, changed and overlapping',
		(_, characters, seed) => {
			const random = mulberry32(seed);
			const width = 60;
			const height = 12;
			let lines = Array.from({length: height}, () => randomLine(random, width - 8, characters));
			let plainRows = 0;
			for (let frame = 0; frame < 120; frame++) {
				// Some lines kept, some new, some moved to another row, as when a value or a plot changes.
				lines = lines.map((line, y) => {
					const r = random();
					if (r < 0.5) return line;
					if (r < 0.8) return randomLine(random, width - 8, characters);
					return lines[(y + 1) % height]!;
				});
				const xs = lines.map((_, y) => (frame + y) % 4);
				// Every fifth row also gets a short line written over its middle (the grid's overwrite).
				const over = lines.map((_, y) => ((frame + y) % 5 === 0 ? {x: 20, text: `${esc}7mover${esc}27m`} : null));
				const output = new Output({width, height});
				const written = lines.map((line, y) => [{x: xs[y]!, text: line}, ...(over[y] ? [over[y]] : []), marker]);
				for (const [y, texts] of written.entries())
					for (const t of texts) output.write(t.x, y, t.text, {transformers: []});
				const rows = output.get().output.split('\n');
				expect(rows).toHaveLength(height);
				for (const [y, texts] of written.entries()) {
					const expected = referenceRow(texts, width);
					// Surely drawn through the grid: a line written over another, or a style left open.
					if (texts.length > 2 || leavesStyleOpen(lines[y]!)) expect(rows[y]).toBe(expected);
					else if (characters === loneCharacters) plainRows++;
					expect(cellsShown(rows[y]!)).toEqual(cellsShown(expected));
				}
			}
			// Rows of plain lines were drawn too (lone characters only).
			if (characters === loneCharacters) expect(plainRows).toBeGreaterThan(100);
		},
	);

	it('draws a line that runs past the right edge, or overlaps another, as the cell grid does', () => {
		const width = 20;
		const cases = [
			[{x: 17, text: `${esc}36mabcdef${esc}39m`}],
			[
				{x: 0, text: 'plain words'},
				{x: 16, text: `${esc}1mbold tail${esc}22m`},
			],
			[
				{x: 2, text: `${esc}32m──────${esc}39m`},
				{x: 5, text: `${esc}31m│${esc}39m`},
			],
		];
		for (const texts of cases) {
			const output = new Output({width, height: 1});
			for (const t of texts) output.write(t.x, 0, t.text, {transformers: []});
			expect(cellsShown(output.get().output)).toEqual(cellsShown(referenceRow(texts, width)));
		}
	});

	it('takes a text’s widest line from the measuring cache, which stays bounded and right', () => {
		// Ink's text rendering now asks measure-text (cached) instead of widest-line (uncached);
		// the cache is emptied at 4,096 texts, so widths stay right past it.
		const random = mulberry32(11);
		for (let i = 0; i < 6000; i++) {
			const text = `${randomLine(random, 30, anyCharacters)}\n${i}${randomLine(random, 20, loneCharacters)}`;
			expect(measureText(text).width).toBe(widestLine(text));
		}
	});
});
