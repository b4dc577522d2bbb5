/**
 * The calibration session file, format `evenecho-scanner-session/1` (JSON): which phantom stills
 * were taken at which settings. A contract shared with `evenecho simulate`: these keys stay, extra
 * optional keys are accepted (and ignored when unknown). Every message names the field path and the
 * allowed range.
 */
import {z} from 'zod';

export const sessionFormat = 'evenecho-scanner-session/1';

/** Master gain as the scanner displays it, dB (the plan's master-gain range). */
const masterGainRange = {min: -20, max: 120};

function ranged(min: number, max: number, unit = '', opts: {integer?: boolean; exclusiveMin?: boolean} = {}) {
	const range = opts.exclusiveMin ? `above ${min} and up to ${max}` : `from ${min} to ${max}`;
	const message = `must be ${opts.integer ? 'a whole number' : 'a number'} ${range}${unit ? ` ${unit}` : ''}`;
	let n = z.number({error: message});
	if (opts.integer) n = n.int({error: message});
	n = opts.exclusiveMin ? n.gt(min, {error: message}) : n.min(min, {error: message});
	return n.max(max, {error: message});
}

const imagePath = z
	.string({error: 'must be the path of an image file, relative to the session file'})
	.min(1, {error: 'must be the path of an image file, relative to the session file'})
	.max(1000, {error: 'must be at most 1000 characters'});

const frame = ranged(1, 100000, '', {integer: true}).optional();

const shot = z.object(
	{image: imagePath, masterGainDb: ranged(masterGainRange.min, masterGainRange.max, 'dB'), frame},
	{error: 'must be an object with image and masterGainDb'},
);

const sliderShot = z.object(
	{
		image: imagePath,
		slider: ranged(1, 16, '', {integer: true}),
		position: ranged(-1, 1).refine((p) => p !== 0, {
			error: 'must be a number from -1 to 1 other than 0 (the slider must be moved)',
		}),
		masterGainDb: ranged(masterGainRange.min, masterGainRange.max, 'dB'),
		frame,
	},
	{error: 'must be an object with image, slider, position and masterGainDb'},
);

export const sessionSchema = z
	.object(
		{
			format: z.literal(sessionFormat, {error: `must be "${sessionFormat}"`}),
			label: z
				.string({error: 'must be text of 1 to 80 characters'})
				.min(1, {error: 'must be text of 1 to 80 characters'})
				.max(80, {error: 'must be text of 1 to 80 characters'}),
			probe: z.object(
				{centerMhz: ranged(0, 50, 'MHz', {exclusiveMin: true}), bandwidthFraction: ranged(0, 1.5).default(0.6)},
				{error: 'must be an object with centerMhz'},
			),
			display: z.object(
				{depthCm: ranged(0, 40, 'cm', {exclusiveMin: true})},
				{error: 'must be an object with depthCm'},
			),
			phantom: z
				.object({
					alphaDbPerCmMhz: ranged(0.05, 2, 'dB/cm/MHz').default(0.5),
					exponent: ranged(1, 2.5).default(1),
					speedMps: ranged(1400, 1700, 'm/s').default(1540),
				})
				.default({alphaDbPerCmMhz: 0.5, exponent: 1, speedMps: 1540}),
			region: z
				.object({
					columns: z
						.tuple([ranged(0, 1), ranged(0, 1)], {
							error: 'must be two fractions [from, to] of the region width, e.g. [0.3, 0.7]',
						})
						.refine(([a, b]) => b - a >= 0.05, {error: 'must be [from, to] with to at least 0.05 above from'})
						.default([0.3, 0.7]),
				})
				.default({columns: [0.3, 0.7]}),
			sliders: z.object({count: ranged(1, 16, '', {integer: true}).default(8)}).default({count: 8}),
			gainSteps: z
				.array(shot, {error: 'must be a list of at least 3 images with their masterGainDb'})
				.min(3, {error: 'must list at least 3 images of the same phantom with only the master gain changed'})
				.max(64, {error: 'must list at most 64 images'}),
			probeInAir: shot.optional(),
			sliderSteps: z
				.array(sliderShot, {error: 'must be a list of slider-step images'})
				.max(32, {error: 'must list at most 32 images'})
				.optional(),
			pixelScale: z
				.object(
					{cmPerPixel: ranged(0, 1, 'cm', {exclusiveMin: true}), topRowCm: ranged(-10, 40, 'cm')},
					{error: 'must be an object with cmPerPixel and topRowCm'},
				)
				.optional(),
		},
		{error: 'must be a JSON object'},
	)
	.superRefine((s, ctx) => {
		const distinct = new Set(s.gainSteps.map((g) => g.masterGainDb));
		if (distinct.size < 3)
			ctx.addIssue({
				code: 'custom',
				path: ['gainSteps'],
				message: 'must have at least 3 different masterGainDb values',
			});
		(s.sliderSteps ?? []).forEach((step, i) => {
			if (step.slider > s.sliders.count)
				ctx.addIssue({
					code: 'custom',
					path: ['sliderSteps', i, 'slider'],
					message: `must be from 1 to sliders.count (${s.sliders.count})`,
				});
		});
	});

export type ScannerSession = z.output<typeof sessionSchema>;

export type SessionParse = {ok: true; value: ScannerSession} | {ok: false; errors: string[]};

export function parseSession(input: unknown): SessionParse {
	const r = sessionSchema.safeParse(input);
	if (r.success) return {ok: true, value: r.data};
	return {
		ok: false,
		errors: r.error.issues.map((i) => `${i.path.length ? i.path.map(String).join('.') : '(session)'}: ${i.message}`),
	};
}
