/**
 * From a band's mean grey to an echo level in dB. A scanner profile measures this map with
 * gain steps on a phantom (Knipp et al. 1997), from band-mean grey, so it already holds the
 * display's grey curve, its smoothing and the log-average bias; without one, a plain logarithmic
 * display of a stated dynamic range is assumed.
 */

export interface LevelMap {
	/** Echo level (dB, on the map's own zero) of a band whose mean grey is `grey`. */
	levelDb(grey: number): number;
	/** The grey whose level is `levelDb` (clamped to the map's grey range). */
	greyAt(levelDb: number): number;
	/** dB per grey step at `grey` (converts the variance of a grey mean into dB²). */
	slopeDbPerGrey(grey: number): number;
	/** Lowest and highest mean grey the map is valid for. */
	readonly greyRange: readonly [low: number, high: number];
	/** True when measured for this scanner; false for the assumed plain log map. */
	readonly calibrated: boolean;
	/** How the map was obtained, for outputs. */
	readonly label: string;
}

/** Plain log compression: grey = 255·(level − (top − DR))/DR, so level = DR·grey/255 + const. */
export function logLevelMap(dynamicRangeDb: number): LevelMap {
	const slope = dynamicRangeDb / 255;
	return {
		levelDb: (grey) => grey * slope,
		greyAt: (levelDb) => Math.min(255, Math.max(0, levelDb / slope)),
		slopeDbPerGrey: () => slope,
		greyRange: [0, 255],
		calibrated: false,
		label: `assumed plain logarithmic display, ${dynamicRangeDb} dB dynamic range`,
	};
}

/**
 * A measured map given as points (grey ascending, level ascending), interpolated linearly between
 * them; not extended beyond the first and last point.
 */
export function tableLevelMap(
	points: readonly {readonly grey: number; readonly levelDb: number}[],
	label: string,
): LevelMap {
	const pts = [...points].sort((a, b) => a.grey - b.grey);
	const segment = (grey: number): number => {
		let i = 1;
		while (i < pts.length - 1 && pts[i]!.grey < grey) i++;
		return i;
	};
	return {
		levelDb(grey) {
			const i = segment(grey);
			const a = pts[i - 1]!;
			const b = pts[i]!;
			const t = b.grey > a.grey ? (grey - a.grey) / (b.grey - a.grey) : 0;
			return a.levelDb + t * (b.levelDb - a.levelDb);
		},
		greyAt(levelDb) {
			const first = pts[0];
			const last = pts[pts.length - 1];
			if (!first || !last) return 0;
			if (levelDb <= first.levelDb) return first.grey;
			if (levelDb >= last.levelDb) return last.grey;
			let i = 1;
			while (i < pts.length - 1 && pts[i]!.levelDb < levelDb) i++;
			const a = pts[i - 1]!;
			const b = pts[i]!;
			const t = b.levelDb > a.levelDb ? (levelDb - a.levelDb) / (b.levelDb - a.levelDb) : 0;
			return a.grey + t * (b.grey - a.grey);
		},
		slopeDbPerGrey(grey) {
			const i = segment(grey);
			const a = pts[i - 1]!;
			const b = pts[i]!;
			return b.grey > a.grey ? (b.levelDb - a.levelDb) / (b.grey - a.grey) : 0;
		},
		greyRange: [pts[0]?.grey ?? 0, pts[pts.length - 1]?.grey ?? 255],
		calibrated: true,
		label,
	};
}
