/**
 * The MNA matrix as seen by the devices: entries addressed by slot numbers
 * handed out once at set-up. Slot 0 is a trash slot for every entry in the
 * ground row or column, so a device stamps without testing for ground.
 */
export abstract class SlotMatrix {
  /** Entries by slot; slot 0 is the trash slot. Fill-in (if any) follows the stamped slots. */
  values = new Float64Array(1);
  protected readonly slotByKey = new Map<number, number>();
  protected readonly rowOf: number[] = [0];
  protected readonly colOf: number[] = [0];
  /** After a failed factor: the values were spoilt by a stale pivot order; stamp afresh and factor again. */
  needsRestamp = false;
  /** After a failed factor: the unknown (column) where elimination found no usable pivot, else -1. */
  singularUnknown = -1;
  /** Slots that devices stamp, trash slot included. */
  protected stampedCount = 1;
  private finalised = false;

  constructor(readonly size: number) {}

  /** Slot for entry (row, col); a negative or out-of-range index means ground: the trash slot. */
  slot(row: number, col: number): number {
    if (row < 0 || col < 0 || row >= this.size || col >= this.size) return 0;
    const key = row * this.size + col;
    let s = this.slotByKey.get(key);
    if (s === undefined) {
      if (this.finalised) throw new Error(`matrix entry (${row}, ${col}) requested after set-up`);
      s = this.addSlot(row, col, key);
    }
    return s;
  }

  protected addSlot(row: number, col: number, key: number): number {
    const s = this.rowOf.length;
    this.slotByKey.set(key, s);
    this.rowOf.push(row);
    this.colOf.push(col);
    return s;
  }

  /** Ends set-up: every diagonal gets an entry, then storage is allocated. */
  finalise(): void {
    for (let i = 0; i < this.size; i++) this.slot(i, i);
    this.finalised = true;
    this.stampedCount = this.rowOf.length;
    this.values = new Float64Array(this.rowOf.length);
  }

  get stampedSlots(): number {
    return this.stampedCount;
  }

  /** Zeroes every entry before a fresh stamp. */
  clear(): void {
    this.values.fill(0);
  }

  /** Factors the stamped matrix in place; false if it is singular. */
  abstract factor(): boolean;
  /** Solves with the factors; `rhs` is overwritten, the answer goes to `x[0..size)`. */
  abstract solve(rhs: Float64Array, x: Float64Array): void;
}
