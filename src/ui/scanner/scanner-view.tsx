/**
 * The measured-scanner panel (key `g`): the plan's measured scanner. Pick a stored scanner profile
 * for the plan (or none: the assumed ramp), or measure one: give a session file, see each image
 * drawn small with the measured region outlined, then the grey map, depth response and
 * penetration, and only then keep it. Draws the panel's state; keys go through the console's one
 * key table and its reducer (ui/state/scanner-reducer).
 */
import {Box, Text} from 'ink';
import {clip} from '../kit/text-fit.js';
import {wrapWords} from '../kit/layout.js';
import {useTheme} from '../kit/theme-context.js';
import type {PlanDocument} from '../../plan/plan-schema.js';
import {measurePages, type MeasurePage, type ScannerOverlay} from '../state/scanner-state.js';
import {pixelScaleOf, roleText} from '../state/session-builder.js';
import {depthResponsePlot, greyMapPlot, penetrationPlot} from './calibration-plots.js';
import {imageThumbnail} from './image-thumbnail.js';

export interface ScannerViewProps {
	readonly overlay: ScannerOverlay;
	/** The plan: the builder takes its probe, slider count and depth. */
	readonly plan: PlanDocument;
	/** The profile the plan names now, if any. */
	readonly chosen: string | undefined;
	readonly width: number;
	readonly height: number;
}

const pageTitles: Record<MeasurePage, string> = {
	images: 'images and measured region',
	grey: 'grey map',
	depth: 'depth response',
	noise: 'penetration',
};

export function ScannerView({overlay, plan, chosen, width, height}: ScannerViewProps) {
	const theme = useTheme();
	const mode = overlay.panel;
	const profiles = overlay.profiles ?? [];
	const lines: Array<{text: string; tone?: 'current' | 'muted' | 'selected' | 'warn'}> = [];
	const push = (text: string, tone?: 'current' | 'muted' | 'selected' | 'warn') =>
		lines.push({text: clip(text, width), ...(tone ? {tone} : {})});
	// Explanations wrap instead of being cut off.
	const note = (text: string, tone: 'muted' | 'warn' = 'muted') => {
		for (const part of wrapWords(text, width)) push(part, tone);
	};
	if (mode.kind === 'list') {
		const cursor = mode.cursor;
		push('Measured scanner for this plan (Enter names it in the plan, c measures a new one, Esc back)', 'current');
		push('A profile replaces the assumed built-in ramp and noise budget with values measured on a phantom.', 'muted');
		const figures = (p: (typeof profiles)[number]) =>
			`${p.probe.centerMhz} MHz ${p.displayDepthCm} cm` +
			(p.penetrationCm === null ? '' : `  reach ${p.penetrationCm.toFixed(1)} cm`) +
			(p.sliderTravelDb === null ? '' : `  travel ${p.sliderTravelDb.toFixed(1)} dB`);
		const rows = [
			'(none) the assumed built-in ramp and noise budget',
			...profiles.map((p) => `${figures(p)}  ${p.name}`),
		];
		rows.forEach((r, i) => {
			const isChosen = i === 0 ? chosen === undefined : profiles[i - 1]!.id === chosen;
			push(`${i === cursor ? '>' : ' '} ${isChosen ? '[x]' : '[ ]'} ${r}`, i === cursor ? 'selected' : undefined);
		});
		const picked = profiles[cursor - 1];
		if (picked) note(`  a plan file names it "scanner": "${picked.id}"`);
		if (overlay.profiles === null) push('  reading the stored profiles…', 'muted');
		else if (!profiles.length)
			push('  No profiles yet: press c and give a session file (evenecho-scanner-session/1).', 'muted');
		for (const problem of overlay.problems.slice(0, 2)) push(`  note: ${problem}`, 'warn');
	} else if (mode.kind === 'path' || mode.kind === 'measuring') {
		push(
			'Measure a scanner from phantom images: a session file, or a folder of DICOM or PNG images to build one',
			'current',
		);
		push(`  session file or folder: ${mode.kind === 'path' ? mode.text : mode.path}${mode.kind === 'path' ? '_' : ''}`);
		if (mode.kind === 'measuring') push('  measuring… (reading the images, then fitting the grey map)', 'muted');
		if (mode.kind === 'path' && mode.error)
			for (const part of wrapWords(mode.error, width - 4).slice(0, 4)) push(`  ${part}`, 'warn');
		push('  Enter measures, Esc back', 'muted');
	} else if (mode.kind === 'build') {
		push(`Build a session from ${mode.folder}: one line per image (Enter types it), then measure`, 'current');
		note(
			'  30 = gain step at master 30 dB · air 30 = probe in air · s4 +1 30 = slider 4 at +1 of travel · empty = not used',
			'muted',
		);
		const rows = Math.max(3, height - lines.length - 5);
		const start = Math.max(0, Math.min(mode.cursor - Math.floor(rows / 2), mode.images.length + 1 - rows));
		mode.images.forEach((im, i) => {
			if (i < start || i >= start + rows) return;
			const isHere = i === mode.cursor;
			const typed = isHere && mode.typing !== null ? `${mode.typing}_` : im.entry;
			push(
				`${isHere ? '>' : ' '} ${clip(im.name, 24).padEnd(24)} ${typed.padEnd(14)} ${isHere && mode.typing !== null ? '' : roleText(im.entry)}`,
				isHere ? 'selected' : undefined,
			);
		});
		const lastRow = mode.images.length + (mode.scale === undefined ? 0 : 1);
		if (mode.scale !== undefined) {
			const isHere = mode.cursor === mode.images.length;
			const typed = isHere && mode.typing !== null ? `${mode.typing}_` : mode.scale;
			const read = pixelScaleOf(mode.scale);
			const said =
				typeof read === 'string'
					? 'cm per pixel, top row cm (e.g. 0.02 0)'
					: `${read.cmPerPixel} cm per pixel, top row at ${read.topRowCm} cm`;
			push(
				`${isHere ? '>' : ' '} ${'PNG depth scale'.padEnd(24)} ${typed.padEnd(14)} ${isHere && mode.typing !== null ? '' : said}`,
				isHere ? 'selected' : undefined,
			);
		}
		push(`${mode.cursor === lastRow ? '>' : ' '} [ Measure these ]`, mode.cursor === lastRow ? 'selected' : undefined);
		note(
			`  Probe ${plan.probe.centerMhz} MHz (${Math.round(plan.probe.bandwidthFraction * 100)} % bandwidth), ` +
				`${plan.sliders.count} sliders and ${plan.display.depthCm} cm depth come from this plan (step 3); the phantom is ` +
				`taken as 0.5 dB/cm/MHz at 1540 m/s — write a session file for another.`,
			'muted',
		);
		if (mode.error) note(mode.error, 'warn');
	} else {
		const {cal, input, page} = mode;
		const p = measurePages[page]!;
		push(
			`"${cal.label}" ${page + 1}/${measurePages.length}: ${pageTitles[p]}   (←→ pages, s keeps, Esc drops)`,
			'current',
		);
		const naming = mode.naming;
		if (naming) {
			// The name line takes the page list's place, so the page below keeps its size.
			const what = naming.replace ? 'Enter keeps it, replacing one of that name' : 'Enter keeps it';
			push(`  keep as: ${naming.text}_   (${what}; Esc back)`, 'selected');
			if (naming.error) push(`  ${naming.error}`, 'warn');
		} else
			push(`  ${measurePages.map((q, i) => (i === page ? `[${pageTitles[q]}]` : pageTitles[q])).join(' · ')}`, 'muted');
		const body = height - 4;
		if (p === 'images') {
			const shots = [
				...input.gainSteps.map((g) => ({name: `${g.masterGainDb} dB ${g.name}`, image: g.image})),
				...(input.probeInAir
					? [{name: `in air ${input.probeInAir.masterGainDb} dB`, image: input.probeInAir.image}]
					: []),
				...(input.sliderSteps ?? []).map((s) => ({
					name: `slider ${s.slider} ${s.position > 0 ? '+' : ''}${s.position}`,
					image: s.image,
				})),
			];
			const tileW = 16;
			const tileH = Math.max(4, Math.min(9, Math.floor((body - 4) / 2) - 1));
			const perRow = Math.max(1, Math.floor(width / (tileW + 2)));
			for (let start = 0; start < shots.length && lines.length < height - 4; start += perRow) {
				const group = shots.slice(start, start + perRow);
				push(group.map((s) => clip(s.name, tileW).padEnd(tileW + 2)).join(''), 'muted');
				const tiles = group.map((s) => imageThumbnail(s.image, input.columns, tileW, tileH));
				for (let r = 0; r < tileH; r++) push(tiles.map((t) => `${t[r]}  `).join(''));
			}
			note(
				`outline: the image region; ':' marks the measured columns ` +
					`(${Math.round(input.columns[0] * 100)}–${Math.round(input.columns[1] * 100)} %); colour pixels are left out`,
				'muted',
			);
		} else if (p === 'grey') {
			for (const l of greyMapPlot(cal, Math.min(width, 72), Math.max(4, body - 4))) push(l);
			note(
				`level (dB, master-gain scale) shown at each grey; fit residual ${cal.rmsResidualDb.toFixed(2)} dB rms`,
				'muted',
			);
		} else if (p === 'depth') {
			for (const l of depthResponsePlot(cal, Math.min(width, 72), Math.max(4, body - 3))) push(l);
			note(
				"Replaces the assumed ramp: the scanner's own depth gain with sliders centred, re its shallowest depth.",
				'muted',
			);
		} else {
			for (const l of penetrationPlot(cal, Math.min(width, 72), Math.max(4, body - 4))) push(l);
			note(
				cal.penetrationCm === null
					? 'penetration not reached or not measured'
					: `echo-to-noise by depth; | at 0 dB; penetration ${cal.penetrationCm.toFixed(1)} cm (v), noise budget ` +
							`${cal.noiseBudgetDb?.toFixed(1)} dB`,
				'muted',
			);
			if (cal.sliderTravelDb !== null)
				note(`slider travel: full travel adds ${cal.sliderTravelDb.toFixed(1)} dB`, 'muted');
		}
		if (mode.message) note(mode.message, 'warn');
		note('A measurement on a phantom: confirm on the live image.', 'muted');
	}
	return (
		<Box flexDirection="column" width={width}>
			{lines.slice(0, height).map((l, i) => (
				<Text
					key={i}
					wrap="truncate"
					{...(l.tone === 'current'
						? theme.current
						: l.tone === 'muted'
							? theme.muted
							: l.tone === 'selected'
								? theme.selected
								: l.tone === 'warn'
									? theme.warning
									: {})}
				>
					{l.text}
				</Text>
			))}
		</Box>
	);
}
