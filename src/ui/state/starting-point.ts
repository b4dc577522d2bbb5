/** A starting point the console offers: the built-in demo, a template or a user preset (pure data). */

export type StartingPointKind = 'demo' | 'template' | 'preset';

export interface StartingPoint {
	readonly id: string;
	readonly name: string;
	readonly region: string;
	readonly kind: StartingPointKind;
}

export const demoPointId = 'built-in:demo';

export const demoPoint: StartingPoint = {
	id: demoPointId,
	name: 'Built-in demo (thick-fat liver)',
	region: 'upper-abdomen',
	kind: 'demo',
};
