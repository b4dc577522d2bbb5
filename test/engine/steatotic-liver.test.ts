/**
 * The steatotic (fatty) liver entry against what the literature reports: attenuation rises with
 * liver fat (Lin, Ophir & Potter 1988, Ultrasound Med Biol 14(8):729; from memory), with scanner
 * cut-offs for steatosis around 0.6–0.7 dB/cm/MHz (from memory, unverified), and the speed of sound
 * falls (Imbault et al. 2017, Phys Med Biol 62:3582; from memory).
 */
import {describe, expect, it} from 'vitest';
import {libraryTissue} from '../../src/engine/tissue-library.js';

describe('steatotic liver', () => {
	const fatty = libraryTissue('steatotic-liver')!;
	const normal = libraryTissue('liver')!;

	it('attenuates more than normal liver, above the usual steatosis cut-offs, with its range', () => {
		expect(fatty.alphaDbPerCmMhz).toBeGreaterThan(normal.alphaDbPerCmMhz);
		expect(fatty.alphaDbPerCmMhz).toBeGreaterThanOrEqual(0.7);
		const [lo, hi] = fatty.spread!.alphaDbPerCmMhz!;
		expect(lo).toBeGreaterThanOrEqual(0.6);
		expect(lo).toBeLessThan(fatty.alphaDbPerCmMhz);
		expect(hi).toBeGreaterThan(fatty.alphaDbPerCmMhz);
	});

	it('carries a lower speed than normal liver, and names its sources with "from memory"', () => {
		expect(fatty.speedMps).toBeLessThan(normal.speedMps);
		expect(fatty.source).toMatch(/Lin, Ophir & Potter 1988/);
		expect(fatty.source).toMatch(/Imbault et al\. 2017/);
		expect(fatty.source).toMatch(/from memory/);
	});
});
