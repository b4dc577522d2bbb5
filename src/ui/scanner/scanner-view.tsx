/**
 * `m` in the console: the plan's measured scanner. Pick a stored scanner profile for the plan (or
 * none: the assumed ramp), or measure one: give a session file, see each image drawn small with
 * the measured region outlined, then the grey map, depth response and penetration, and only then
 * save it. The view owns its keys while open; the console gets the choice back through onChoose.
 */
import {Box, Text, useInput} from 'ink';
import {useEffect, useState} from 'react';
import type {ScannerProfile} from '../../calibration/profile-document.js';
import type {CalibrationInput, ScannerCalibration} from '../../calibration/scanner-calibration.js';
import {clip} from '../kit/text-fit.js';
import {wrapWords} from '../kit/layout.js';
import {useTheme} from '../kit/theme-context.js';
import {depthResponsePlot, greyMapPlot, penetrationPlot} from './calibration-plots.js';
import {imageThumbnail} from './image-thumbnail.js';

/** What the view needs from outside (the store and the image reader), so it stays testable. */
export interface ScannerServices {
	readonly listProfiles: () => readonly ScannerProfile[];
	/** Reads a session file and its images; throws with a message naming the field on bad input. */
	readonly loadSession: (path: string) => CalibrationInput;
	readonly calibrate: (input: CalibrationInput) => ScannerCalibration;
	/** Stores a calibration as a profile; returns its id; throws when the name is taken and not `replace`. */
	readonly save: (calibration: ScannerCalibration, replace: boolean) => string;
}

export interface ScannerViewProps {
	readonly services: ScannerServices;
	/** The profile the plan names now, if any. */
	readonly chosen: string | undefined;
	readonly width: number;
	readonly height: number;
	/** Picks a profile for the plan (null: none, the assumed ramp) and closes the view. */
	readonly onChoose: (id: string | null) => void;
	readonly onClose: () => void;
}

type Page = 'images' | 'grey' | 'depth' | 'noise';
const pages: readonly Page[] = ['images', 'grey', 'depth', 'noise'];
const pageTitles: Record<Page, string> = {images: 'images and measured region', grey: 'grey map', depth: 'depth response', noise: 'penetration'};

type Mode =
	| {kind: 'list'}
	| {kind: 'path'; text: string; error?: string}
	| {kind: 'measuring'; path: string}
	| {kind: 'result'; input: CalibrationInput; cal: ScannerCalibration; page: number; message?: string};

export function ScannerView({services, chosen, width, height, onChoose, onClose}: ScannerViewProps) {
	const theme = useTheme();
	const [profiles, setProfiles] = useState(() => services.listProfiles());
	const [cursor, setCursor] = useState(() => Math.max(0, profiles.findIndex((p) => p.id === chosen) + 1));
	const [mode, setMode] = useState<Mode>({kind: 'list'});

	// Measuring takes a moment: draw "measuring…" first, then work.
	useEffect(() => {
		if (mode.kind !== 'measuring') return;
		const timer = setTimeout(() => {
			try {
				const input = services.loadSession(mode.path);
				setMode({kind: 'result', input, cal: services.calibrate(input), page: 0});
			} catch (error) {
				setMode({kind: 'path', text: mode.path, error: error instanceof Error ? error.message : String(error)});
			}
		}, 10);
		return () => clearTimeout(timer);
	}, [mode, services]);

	useInput((input, key) => {
		if (mode.kind === 'list') {
			const rows = profiles.length + 1;
			if (key.escape || input === 'q') onClose();
			else if (key.upArrow || input === 'k') setCursor((c) => Math.max(0, c - 1));
			else if (key.downArrow || input === 'j') setCursor((c) => Math.min(rows - 1, c + 1));
			else if (key.return) onChoose(cursor === 0 ? null : profiles[cursor - 1]!.id);
			else if (input === 'c') setMode({kind: 'path', text: ''});
		} else if (mode.kind === 'path') {
			if (key.escape) setMode({kind: 'list'});
			else if (key.return && mode.text.trim()) setMode({kind: 'measuring', path: mode.text.trim()});
			else if (key.backspace || key.delete) setMode({kind: 'path', text: mode.text.slice(0, -1)});
			else if (input && !key.ctrl && !key.meta && !key.tab && !/[\u0000-\u001f\u007f]/.test(input)) setMode({kind: 'path', text: mode.text + input});
		} else if (mode.kind === 'result') {
			if (key.escape) setMode({kind: 'list'});
			else if (key.rightArrow || input === 'l') setMode({...mode, page: Math.min(pages.length - 1, mode.page + 1)});
			else if (key.leftArrow || input === 'h') setMode({...mode, page: Math.max(0, mode.page - 1)});
			else if (input === 's' || input === 'S') {
				try {
					const id = services.save(mode.cal, input === 'S');
					const listed = services.listProfiles();
					setProfiles(listed);
					setCursor(Math.max(0, listed.findIndex((p) => p.id === id) + 1));
					setMode({kind: 'list'});
				} catch (error) {
					setMode({...mode, message: `${error instanceof Error ? error.message : String(error)}${input === 's' ? ' (S replaces it)' : ''}`});
				}
			}
		}
	});

	const lines: Array<{text: string; tone?: 'current' | 'muted' | 'selected' | 'warn'}> = [];
	const push = (text: string, tone?: 'current' | 'muted' | 'selected' | 'warn') => lines.push({text: clip(text, width), ...(tone ? {tone} : {})});
	if (mode.kind === 'list') {
		push('Measured scanner for this plan (Enter picks, c measures a new one, Esc back)', 'current');
		push('A profile replaces the assumed built-in ramp and noise budget with values measured on a phantom.', 'muted');
		const rows = ['(none) the assumed built-in ramp and noise budget', ...profiles.map((p) => `${p.id}  ${p.label}  ${p.probe.centerMhz} MHz ${p.displayDepthCm} cm${p.penetrationCm === null ? '' : `  reach ${p.penetrationCm.toFixed(1)} cm`}${p.sliderTravelDb === null ? '' : `  travel ${p.sliderTravelDb.toFixed(1)} dB`}`)];
		rows.forEach((r, i) => {
			const isChosen = i === 0 ? chosen === undefined : profiles[i - 1]!.id === chosen;
			push(`${i === cursor ? '>' : ' '} ${isChosen ? '[x]' : '[ ]'} ${r}`, i === cursor ? 'selected' : undefined);
		});
		if (!profiles.length) push('  No profiles yet: press c and give a session file (evenecho-scanner-session/1).', 'muted');
	} else if (mode.kind === 'path' || mode.kind === 'measuring') {
		push('Measure a scanner: the session file (its image paths are relative to it)', 'current');
		push(`  session file: ${mode.kind === 'path' ? mode.text : mode.path}${mode.kind === 'path' ? '_' : ''}`);
		if (mode.kind === 'measuring') push('  measuring… (reading the images, then fitting the grey map)', 'muted');
		if (mode.kind === 'path' && mode.error) for (const part of wrapWords(mode.error, width - 4).slice(0, 4)) push(`  ${part}`, 'warn');
		push('  Enter measures, Esc back', 'muted');
	} else {
		const {cal, input, page} = mode;
		const p = pages[page]!;
		push(`"${cal.label}": ${pages.map((q, i) => (i === page ? `[${pageTitles[q]}]` : pageTitles[q])).join('  ')}   (←→ pages, s saves, Esc discards)`, 'current');
		const body = height - 3;
		if (p === 'images') {
			const shots = [
				...input.gainSteps.map((g) => ({name: `${g.name} ${g.masterGainDb} dB`, image: g.image})),
				...(input.probeInAir ? [{name: `in air ${input.probeInAir.masterGainDb} dB`, image: input.probeInAir.image}] : []),
				...(input.sliderSteps ?? []).map((s) => ({name: `slider ${s.slider} ${s.position > 0 ? '+' : ''}${s.position}`, image: s.image})),
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
			push(`outline: the image region; ':' marks the measured columns (${Math.round(input.columns[0] * 100)}–${Math.round(input.columns[1] * 100)} %); colour pixels are left out`, 'muted');
		} else if (p === 'grey') {
			for (const l of greyMapPlot(cal, Math.min(width, 72), Math.max(4, body - 4))) push(l);
			push(`level (dB, master-gain scale) shown at each grey; fit residual ${cal.rmsResidualDb.toFixed(2)} dB rms`, 'muted');
		} else if (p === 'depth') {
			for (const l of depthResponsePlot(cal, Math.min(width, 72), Math.max(4, body - 3))) push(l);
			push('the scanner\'s own depth gain with sliders centred, re the shallowest depth (replaces the assumed ramp)', 'muted');
		} else {
			for (const l of penetrationPlot(cal, Math.min(width, 72), Math.max(4, body - 4))) push(l);
			push(cal.penetrationCm === null ? 'penetration not reached or not measured' : `echo-to-noise by depth; | at 0 dB; penetration ${cal.penetrationCm.toFixed(1)} cm (v), noise budget ${cal.noiseBudgetDb?.toFixed(1)} dB`, 'muted');
			if (cal.sliderTravelDb !== null) push(`slider travel: full travel adds ${cal.sliderTravelDb.toFixed(1)} dB`, 'muted');
		}
		if (mode.message) push(mode.message, 'warn');
		push('A measurement on a phantom: confirm on the live image.', 'muted');
	}
	return (
		<Box flexDirection="column" width={width}>
			{lines.slice(0, height).map((l, i) => (
				<Text key={i} wrap="truncate" {...(l.tone === 'current' ? theme.current : l.tone === 'muted' ? theme.muted : l.tone === 'selected' ? theme.selected : l.tone === 'warn' ? theme.warning : {})}>
					{l.text}
				</Text>
			))}
		</Box>
	);
}

