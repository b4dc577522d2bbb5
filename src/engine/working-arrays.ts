/**
 * Working arrays the slider fit's solvers keep from one call to the next.
 *
 * A typed array larger than 64 bytes is stored outside V8's heap: making one is a zeroed allocation
 * from the C library, and collecting it a free. The fit made about thirty such arrays per curve, and
 * on a 2-core machine their allocation cost more than a tenth of a 10,000-row table's time (a CPU
 * profile, 2026-12). The solvers are synchronous and never re-entered, so one set per solver
 * serves every call; each worker thread loads its own copy of the module, so threads never share one.
 * A caller gets a view of exactly the length it asked for, zeroed, so the code that uses it reads as
 * it did with a fresh array.
 */

type TypedArray = Float64Array | Int32Array | Uint8Array;

/** Room for one typed array that grows to the largest length asked for and hands out zeroed views. */
export class WorkingArray<T extends TypedArray> {
	private buffer: T;
	/** The last view handed out: asked again for the same length (the usual case), it is handed out again. */
	private view: T;

	constructor(private readonly make: (length: number) => T) {
		this.buffer = make(0);
		this.view = this.buffer;
	}

	/** A zeroed view of `length` elements; valid until the next call (its contents are then overwritten). */
	take(length: number): T {
		if (this.view.length !== length) {
			if (this.buffer.length < length) this.buffer = this.make(Math.max(length, 2 * this.buffer.length));
			this.view = this.buffer.subarray(0, length) as T;
		}
		this.view.fill(0);
		return this.view;
	}
}

export const float64Room = (): WorkingArray<Float64Array> => new WorkingArray((n) => new Float64Array(n));
export const int32Room = (): WorkingArray<Int32Array> => new WorkingArray((n) => new Int32Array(n));
export const uint8Room = (): WorkingArray<Uint8Array> => new WorkingArray((n) => new Uint8Array(n));
