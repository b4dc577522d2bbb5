/** An invented check plan: the echo falls below the noise floor at about 6 cm and meets bone at 8 cm. */
export const boneAndNoisePlanJson = {
	name: 'Bone and noise check',
	layers: [
		{tissue: 'fat', thicknessCm: 2},
		{tissue: 'liver', thicknessCm: 6},
		{tissue: 'cortical-bone', thicknessCm: 1},
		{tissue: 'soft-tissue', thicknessCm: 10},
	],
	probe: {centerMhz: 3.5},
	noiseBudgetDb: 22,
} as const;
