// Growable Float64 columns for logs of unknown length: doubling typed arrays, so an hour at 1 kHz
// (3.6 M samples × ~50 columns) costs a handful of copies instead of a JavaScript array per value.

export class ColumnStore {
  private capacity: number;
  readonly columns: Float64Array[];
  count = 0;

  constructor(width: number, initialCapacity = 4096) {
    this.capacity = initialCapacity;
    this.columns = Array.from({ length: width }, () => new Float64Array(initialCapacity));
  }

  /** Index of a new row (values NaN until set). */
  addRow(): number {
    if (this.count === this.capacity) {
      this.capacity *= 2;
      for (let c = 0; c < this.columns.length; c++) {
        const grown = new Float64Array(this.capacity);
        grown.set(this.columns[c]);
        this.columns[c] = grown;
      }
    }
    return this.count++;
  }

  /** The columns cut to the rows written. */
  finish(): Float64Array[] {
    return this.columns.map((c) => c.subarray(0, this.count));
  }
}
