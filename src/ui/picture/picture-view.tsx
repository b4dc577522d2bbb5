/**
 * The plan as a picture in the console, in place of the curve plot (key p): "built-in ramp only"
 * and "this plan" side by side, or one of them on a narrow screen. Labelled an illustration on
 * every frame. The speckle is kept between frames, so a gain change only re-maps grey.
 */
import {Box, Text} from 'ink';
import {memo, useRef} from 'react';
import type {CurveResult} from '../../engine/types.js';
import {createPictureCache, type PanelKind, type PictureCache} from '../../simulate/plan-picture.js';
import {useTheme} from '../kit/theme-context.js';
import {clip} from '../kit/text-fit.js';
import {wrapWords} from '../kit/layout.js';
import {pictureModeFromEnv, type PictureMode} from './picture-cells.js';
import {illustrationLabel, panelChrome, panelLegend, panelLines} from './picture-panels.js';

export interface PictureViewProps {
	readonly curve: CurveResult;
	readonly kinds: readonly PanelKind[];
	readonly width: number;
	readonly height: number;
}

/** Picture mode for this terminal: the theme's plain variant (NO_COLOR) always gives characters. */
export function usePictureMode(): PictureMode {
	const theme = useTheme();
	return theme.name === 'plain' ? 'plain' : pictureModeFromEnv(process.env);
}

function PictureViewImpl({curve, kinds, width, height}: PictureViewProps) {
	const theme = useTheme();
	const mode = usePictureMode();
	const cache = useRef<PictureCache | null>(null);
	cache.current ??= createPictureCache(1);
	const gap = 2 * (kinds.length - 1);
	const pictureColumns = Math.max(4, Math.floor((width - gap) / kinds.length) - panelChrome);
	const label = wrapWords(illustrationLabel, width);
	// One title line above the pictures, the legend and the label below.
	const pictureRows = Math.max(3, height - label.length - 2);
	const lines = panelLines(curve, cache.current, kinds, {pictureColumns, pictureRows}, mode);
	return (
		<Box flexDirection="column" width={width}>
			{lines.map((l, i) => (
				<Text key={i} wrap="truncate">
					{l}
				</Text>
			))}
			<Text wrap="truncate" {...theme.muted}>
				{clip(panelLegend(), width)}
			</Text>
			{label.map((l) => (
				<Text key={l} wrap="truncate" {...theme.caution}>
					{clip(l, width)}
				</Text>
			))}
		</Box>
	);
}

/** Memoised like the plot; the panel kinds compare by content (callers pass a fresh array each time). */
export const PictureView = memo(
	PictureViewImpl,
	(a, b) => a.curve === b.curve && a.width === b.width && a.height === b.height && a.kinds.join() === b.kinds.join(),
);
