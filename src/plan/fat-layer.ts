/**
 * Which layer is "the fat": the first layer of library tissue `fat`, skin down. The console's
 * measured-fat field, its fat-thickness sweep and `evenecho table --fat` all ask these two.
 */
import type {PlanDocument} from './plan-schema.js';

type Layers = Pick<PlanDocument, 'layers'>;

/** The fat layer's 0-based index, or null when the plan has none. */
export function fatLayerIndex(doc: Layers): number | null {
	const i = doc.layers.findIndex((l) => l.tissue === 'fat');
	return i >= 0 ? i : null;
}

/** The fat layer when its thickness can matter: not the deepest layer, which extends as far as needed. */
export function fatLayerToSweep(doc: Layers): number | null {
	const i = fatLayerIndex(doc);
	return i !== null && i < doc.layers.length - 1 ? i : null;
}
