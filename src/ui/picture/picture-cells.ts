/**
 * Terminal cells from grey pixels (pure: no Ink, no process). One cell shows two pixel rows: the
 * upper half block U+2580 with the upper pixel as foreground and the lower as background, in 24-bit
 * grey or the 256-colour grey ramp (232–255); without colour or Unicode, one shading character per
 * cell from the mean of its two pixels.
 */

export type PictureMode = 'truecolor' | '256' | 'plain';

/** Ten shades, darkest first (plain characters only, readable on any terminal). */
export const plainShades = ' .:-=+*#%@';
const upperHalf = '\u2580';
const reset = '\u001B[0m';

/** 256-colour grey ramp index for a grey value: 232 + clamp(round((v − 8)/10), 0, 23). */
export function greyRampIndex(v: number): number {
	return 232 + Math.min(23, Math.max(0, Math.round((v - 8) / 10)));
}

export function plainShade(v: number): string {
	return plainShades[Math.min(plainShades.length - 1, Math.floor((v * plainShades.length) / 256))]!;
}

/** Pre-built escape strings so a redraw only concatenates (no number formatting per cell). */
const trueFg = Array.from({length: 256}, (_, v) => `\u001B[38;2;${v};${v};${v}m`);
const trueBg = Array.from({length: 256}, (_, v) => `\u001B[48;2;${v};${v};${v}m`);
const rampFg = Array.from({length: 256}, (_, v) => `\u001B[38;5;${greyRampIndex(v)}m`);
const rampBg = Array.from({length: 256}, (_, v) => `\u001B[48;5;${greyRampIndex(v)}m`);

/**
 * Lines of cells for a grey picture `width` pixels wide and `height` pixels high (height even:
 * an odd last row is paired with black). Each coloured line ends with a reset.
 */
export function pictureLines(grey: Uint8Array, width: number, height: number, mode: PictureMode): string[] {
	const lines: string[] = [];
	const fg = mode === 'truecolor' ? trueFg : rampFg;
	const bg = mode === 'truecolor' ? trueBg : rampBg;
	for (let y = 0; y < height; y += 2) {
		const upper = y * width;
		const lower = y + 1 < height ? (y + 1) * width : -1;
		let line = '';
		if (mode === 'plain') {
			for (let x = 0; x < width; x++)
				line += plainShade(lower < 0 ? grey[upper + x]! / 2 : (grey[upper + x]! + grey[lower + x]!) / 2);
		} else {
			let lastTop = -1;
			let lastBottom = -1;
			for (let x = 0; x < width; x++) {
				const top = grey[upper + x]!;
				const bottom = lower < 0 ? 0 : grey[lower + x]!;
				// Same escape as the previous cell: skip it (a third of the characters on smooth rows).
				if (mode === 'truecolor' ? top !== lastTop : fg[top] !== fg[lastTop] || lastTop < 0) line += fg[top];
				if (mode === 'truecolor' ? bottom !== lastBottom : bg[bottom] !== bg[lastBottom] || lastBottom < 0)
					line += bg[bottom];
				line += upperHalf;
				lastTop = top;
				lastBottom = bottom;
			}
			line += reset;
		}
		lines.push(line);
	}
	return lines;
}

/** How to draw pictures in this environment: NO_COLOR, TERM=dumb or a locale without UTF-8 give
 * plain characters; COLORTERM truecolor/24bit gives 24-bit grey; anything else the 256-colour ramp. */
export function pictureModeFromEnv(env: Readonly<Record<string, string | undefined>>): PictureMode {
	const noColor = env['NO_COLOR'];
	if (noColor !== undefined && noColor !== '') return 'plain';
	if ((env['TERM'] ?? '') === 'dumb') return 'plain';
	const locale = env['LC_ALL'] || env['LC_CTYPE'] || env['LANG'] || '';
	if (locale !== '' && !/utf-?8/i.test(locale)) return 'plain';
	const colorterm = (env['COLORTERM'] ?? '').toLowerCase();
	return colorterm === 'truecolor' || colorterm === '24bit' ? 'truecolor' : '256';
}
