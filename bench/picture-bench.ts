/**
 * Picture benchmarks: the console's picture redraw after a gain change (both panels at 100×30,
 * speckle and echo map cached, only grey re-mapped and cells drawn), making a 600×480 preview PNG
 * from nothing (speckle included), and the whole demo phantom series written as DICOM bytes.
 */
import {computeCurve} from '../src/engine/compensation-curve.js';
import {derivedUid, encodeUltrasoundDicom} from '../src/image/dicom-writer.js';
import {encodePng} from '../src/image/png-writer.js';
import {demoPlan} from '../src/plan/demo-plan.js';
import {resolvePlan} from '../src/plan/resolve-plan.js';
import {phantomSeries} from '../src/simulate/demo-images.js';
import {createPictureCache} from '../src/simulate/plan-picture.js';
import {previewPicture} from '../src/simulate/preview-picture.js';
import {panelChrome, panelLines} from '../src/ui/picture/picture-panels.js';
import {median, measure, note, target} from './bench-tools.js';

/** Median wall time of `runs` calls after one warm-up, ms. */
async function medianWallMs(fn: () => unknown, runs: number): Promise<number> {
	await fn();
	const times: number[] = [];
	for (let i = 0; i < runs; i++) times.push((await measure(fn)).wallMs);
	return median(times);
}

export async function run(): Promise<void> {
	console.log('pictures');
	const plan = resolvePlan(demoPlan());
	const result = computeCurve(plan);
	// Two results that differ only in gain (master ±3 dB): the echo map stays cached between them.
	const louder = {...result, fit: {...result.fit, masterGainDb: result.fit.masterGainDb + 3}};
	const cache = createPictureCache(1);
	const columns = Math.floor((100 - 2) / 2) - panelChrome - 2;
	const size = {pictureColumns: columns, pictureRows: 30 - 6};
	let flip = false;
	const redraw = () => {
		flip = !flip;
		panelLines(flip ? result : louder, cache, ['ramp', 'plan'], size, 'truecolor');
	};
	const redrawMs = await medianWallMs(redraw, 101);
	target(
		`picture redraw after a gain change, both panels ${columns}×${size.pictureRows} cells (100×30 console), median`,
		`${redrawMs.toFixed(2)} ms`,
		'≤ 4 ms',
		redrawMs <= 4,
	);

	const pngMs = await medianWallMs(() => {
		const pic = previewPicture(result, createPictureCache(2), 'plan', 600, 480, 60);
		encodePng({width: pic.width, height: pic.height, channels: 1, data: pic.grey});
	}, 7);
	note('600×480 preview PNG from nothing (speckle, echo map, grey, encode), median', `${pngMs.toFixed(1)} ms`);

	const seriesMs = await medianWallMs(() => {
		const set = phantomSeries(plan, 1, 'dcm');
		for (const [k, img] of set.images.entries()) {
			encodeUltrasoundDicom({
				image: {width: img.width, height: img.height, channels: img.channels, data: img.data},
				region: {...set.region, cmPerPixel: set.cmPerPixel, centerMhz: plan.probe.centerMhz},
				studyUid: derivedUid('s'),
				seriesUid: derivedUid('r'),
				instanceUid: derivedUid('i', k),
				instanceNumber: k + 1,
				seriesDescription: 'bench',
				comments: 'bench',
			});
		}
	}, 3);
	note('phantom series (7 DICOM images 600×480 + truth), in memory, median', `${seriesMs.toFixed(0)} ms`);
}
