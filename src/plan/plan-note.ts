/**
 * A plan's note travels with it, but a template's note describes the template's own values
 * ("fat 2 cm … 3.5 MHz"). Once the values change, saved and exported plans carry the note marked as
 * written for the starting plan before the changes, with a line of the plan's values as they now are.
 * The mark is rebuilt on every save, never stacked. Pure.
 */
import {libraryTissue} from '../engine/tissue-library.js';
import type {PlanDocument} from './plan-schema.js';

/** How a marked note begins; the mark runs to the first "]". */
export const noteMarkStart = '[Note written for';

/** The plan without its name and note: what "the values changed" compares. */
function valuesOf(doc: PlanDocument): string {
	const {name: _name, note: _note, ...values} = doc;
	return JSON.stringify(values);
}

const cm = (x: number) => String(Number(x.toFixed(2)));

/** "Fat (subcutaneous) 8 cm on screen, Liver 20 cm; 2.5 MHz; display 16 cm; 8 sliders". */
export function valuesLine(doc: PlanDocument): string {
	const layers = doc.layers
		.map((l) => {
			const named = typeof l.tissue === 'string' ? (libraryTissue(l.tissue)?.label ?? l.tissue) : l.tissue.label;
			// No "]" inside the mark, which ends at the first one.
			const label = named.replaceAll(']', ')');
			return `${label} ${cm(l.thicknessCm)} cm${l.thicknessAs === 'displayed' ? ' on screen' : ''}`;
		})
		.join(', ');
	const receive = doc.probe.receive && doc.probe.receive !== 'fundamental' ? ` ${doc.probe.receive}` : '';
	return `${layers}; ${cm(doc.probe.centerMhz)} MHz${receive}; display ${cm(doc.display.depthCm)} cm; ${doc.sliders.count} sliders`;
}

/** The note without any mark this module added earlier. */
export function unmarkedNote(note: string): string {
	if (!note.startsWith(noteMarkStart)) return note;
	const end = note.indexOf(']');
	return end < 0 ? note : note.slice(end + 1).trimStart();
}

/** Whether the plan's values differ from the starting plan's (name and note aside). */
export function valuesChanged(doc: PlanDocument, start: PlanDocument): boolean {
	return valuesOf(doc) !== valuesOf(start);
}

/**
 * The plan as it should be written: unchanged when its values are the starting plan's (or it has no
 * note), else with the note marked as the starting plan's, before the changes, and the values now.
 */
export function planWithNote(
	doc: PlanDocument,
	start: {readonly name: string; readonly doc: PlanDocument},
): PlanDocument {
	if (!doc.note || !valuesChanged(doc, start.doc)) return doc;
	// A note marked before (a saved preset changed again) keeps the name it was first written for.
	const first = new RegExp(`^\\${noteMarkStart} "([^"\\]]*)"`).exec(doc.note)?.[1] ?? start.name;
	const mark = `${noteMarkStart} "${first}", before your changes; this plan now has: ${valuesLine(doc)}.]`;
	const note = `${mark} ${unmarkedNote(doc.note)}`;
	// The format caps a note at 2,000 characters: the mark stays whole, the old text gives way.
	return {...doc, note: note.length <= 2000 ? note : `${note.slice(0, 1999)}…`};
}
