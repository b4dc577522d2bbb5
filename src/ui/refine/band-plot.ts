/**
 * Band levels against the plan as text, pure and colour-free: one row per depth band (skin at the
 * top, as everywhere in the console), level across. `o` the level measured in tissue speckle, `x`
 * a band measured but not usable, `+` the level the plan expects under the settings the image was
 * taken with (`*` where the two fall on one cell); the verdict of an unusable band at the row's end.
 */
import type {RefineResult} from '../../analysis/refine-image.js';

export const bandGlyph = {measured: 'o', unusable: 'x', expected: '+', both: '*'} as const;

const shortVerdict: Record<string, string> = {
	'too-few-cells': 'few cells',
	dark: 'dark',
	clipped: 'clipped',
	'below-noise': 'noise',
	'off-map': 'off map',
	'beyond-profile': 'no profile',
};

/** `height` lines: one per band (every second one, or fewer, when they do not all fit) and the dB axis. */
export function bandPlot(r: RefineResult, width: number, height: number): string[] {
	const stride = Math.max(1, Math.ceil(r.bands.length / Math.max(1, height - 1)));
	const bands = r.bands.filter((_, i) => i % stride === 0);
	const values = bands.flatMap((b) => [b.levelDb, b.expectedDb]).filter(Number.isFinite);
	const lo = Math.floor(Math.min(...values, 0) - 1);
	const hi = Math.ceil(Math.max(...values, lo + 10) + 1);
	const note = 11; // room for the verdict after the row
	const plotW = Math.max(10, width - 8 - note);
	const at = (v: number) => Math.min(plotW - 1, Math.max(0, Math.round(((v - lo) / (hi - lo)) * (plotW - 1))));
	const out = bands.map((b) => {
		const row = new Array<string>(plotW).fill(' ');
		if (Number.isFinite(b.expectedDb)) row[at(b.expectedDb)] = bandGlyph.expected;
		if (Number.isFinite(b.levelDb)) {
			const c = at(b.levelDb);
			row[c] =
				row[c] === bandGlyph.expected && b.usable ? bandGlyph.both : b.usable ? bandGlyph.measured : bandGlyph.unusable;
		}
		const verdict = b.usable ? (b.fitted ? 'fitted' : '') : (shortVerdict[b.verdict] ?? b.verdict);
		return `${b.depthCm.toFixed(1).padStart(5)}cm|${row.join('')} ${verdict}`.slice(0, width);
	});
	const left = `${lo} dB`;
	const right = `${hi} dB`;
	out.push(
		`${' '.repeat(7)}+${left}${'-'.repeat(Math.max(1, plotW - left.length - right.length))}${right}`.slice(0, width),
	);
	return out;
}
