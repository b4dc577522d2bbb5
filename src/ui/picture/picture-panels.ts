/**
 * The plan's pictures as text panels (pure): each panel a title, a depth scale in cm on the left,
 * the picture, and a mark column on the right for the slider knots; the noise-floor and barrier
 * depths are marked beside the scale. Marks are characters, so meaning never rests on colour.
 */
import type {CurveResult} from '../../engine/types.js';
import {travelFractionText} from '../../report/curve-summary.js';
import type {PanelKind, PictureCache} from '../../simulate/plan-picture.js';
import {pictureLines, type PictureMode} from './picture-cells.js';

export const panelTitles: Record<PanelKind, string> = {
	ramp: 'built-in ramp only',
	plan: 'this plan',
};

/** A panel's title: with a measured scanner, the sliders-centred panel shows its measured depth gain, not the ramp. */
export function panelTitle(kind: PanelKind, result: CurveResult): string {
	return kind === 'ramp' && result.plan.scanner ? 'measured gain only' : panelTitles[kind];
}

/**
 * With a measured scanner that has a travel: each slider as a fraction of its full travel, as it
 * is set on that scanner ("1 −0.40  2 −0.28 …"); null otherwise.
 */
export function travelLine(result: CurveResult): string | null {
	const travel = result.plan.scanner?.sliderTravelDb;
	if (!travel) return null;
	const parts = result.fit.sliders.map((s, k) => `${knotLabel(k + 1)} ${travelFractionText(s.gainDb / travel)}`);
	return `sliders as a fraction of travel (full travel ${travel.toFixed(1)} dB, measured): ${parts.join('  ')}`;
}

export const illustrationLabel =
	"Illustration: a uniform tissue under this model, not a prediction of the patient's image.";

/** Text columns a panel needs around its picture: scale (4), depth mark (1), knot mark (2). */
export const panelChrome = 7;

export interface PanelSize {
	/** Picture width in cells (= pixels). */
	readonly pictureColumns: number;
	/** Picture height in text rows (= 2 pixel rows each). */
	readonly pictureRows: number;
}

/** Slider numbers 1–9, then a–g for banks of up to 16. */
function knotLabel(k: number): string {
	return k <= 9 ? String(k) : String.fromCharCode(87 + k);
}

/** Row index (0-based text row) of a displayed depth. */
function rowOf(depthCm: number, displayCm: number, rows: number): number {
	return Math.min(rows - 1, Math.max(0, Math.floor((depthCm / displayCm) * rows)));
}

/**
 * Lines of the requested panels side by side (two spaces between), titles on top. All lines of a
 * panel have the same visible width: pictureColumns + panelChrome.
 */
export function panelLines(
	result: CurveResult,
	cache: PictureCache,
	kinds: readonly PanelKind[],
	size: PanelSize,
	mode: PictureMode,
): string[] {
	const {pictureColumns: w, pictureRows: rows} = size;
	const pics = cache.pictures(result, w, rows * 2);
	const displayCm = result.plan.display.depthCm;
	const unicode = mode !== 'plain';
	const edge = unicode ? '\u2502' : '|';
	const knotRows = new Map<number, number>();
	result.fit.sliders.forEach((s, k) => knotRows.set(rowOf(s.depthCm, displayCm, rows), k + 1));
	const floorRow = result.penetrationDepthCm === null ? -1 : rowOf(result.penetrationDepthCm, displayCm, rows);
	const blockedRow = result.blockedDepthCm === null ? -1 : rowOf(result.blockedDepthCm, displayCm, rows);
	const cmPerRow = displayCm / rows;
	const labelEvery = cmPerRow > 0.5 ? 4 : 2;
	const scale: string[] = [];
	for (let r = 0; r < rows; r++) {
		// Label the row that holds a multiple of labelEvery cm.
		const cm = Math.ceil((r * cmPerRow - 1e-9) / labelEvery) * labelEvery;
		const labelled = cm < (r + 1) * cmPerRow - 1e-9 && cm <= displayCm;
		const mark = r === blockedRow ? '#' : r === floorRow ? '~' : edge;
		scale.push(`${labelled ? String(cm).padStart(3) : '   '} ${mark}`);
	}
	const columns = kinds.map((kind) => {
		const picture = pictureLines(kind === 'ramp' ? pics.ramp : pics.plan, w, rows * 2, mode);
		const title = panelTitle(kind, result)
			.slice(0, w + panelChrome)
			.padEnd(w + panelChrome);
		const body = picture.map((line, r) => {
			const knot = knotRows.get(r);
			return `${scale[r]}${line}${knot === undefined ? `${edge} ` : `<${knotLabel(knot)}`}`;
		});
		return [title, ...body];
	});
	const out: string[] = [];
	for (let i = 0; i < rows + 1; i++) out.push(columns.map((c) => c[i]!).join('  '));
	return out;
}

/** The legend under the panels: what each mark means, in words. */
export function panelLegend(): string {
	return 'cm at left  <n slider n  ~ noise floor  # barrier';
}
