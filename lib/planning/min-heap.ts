/**
 * Indexed binary min-heap over typed arrays, for Dijkstra on (tile, heading) states.
 *
 * Keys live in a caller-owned Float64Array (the tentative distances), so decrease-key is a
 * sift-up from the item's recorded position. Assumes items are integers in [0, capacity).
 * Reference: Cormen, Leiserson, Rivest and Stein, "Introduction to Algorithms" (3rd ed.), §6.5
 * (priority queues), from memory.
 */
export class IndexedMinHeap {
  private readonly items: Int32Array;
  /** Position of each item in `items`, −1 when absent. */
  private readonly position: Int32Array;
  private count = 0;

  /** capacity = number of distinct items; key = their priorities, read on every comparison. */
  constructor(
    capacity: number,
    private readonly key: Float64Array,
  ) {
    this.items = new Int32Array(capacity);
    this.position = new Int32Array(capacity).fill(-1);
  }

  /** Number of queued items. */
  get size(): number {
    return this.count;
  }

  /** Queues `item` or, if queued already, restores order after its key was lowered. */
  pushOrDecrease(item: number): void {
    let at = this.position[item];
    if (at < 0) {
      at = this.count++;
      this.items[at] = item;
      this.position[item] = at;
    }
    this.siftUp(at);
  }

  /** Removes and returns the item of least key; the heap must not be empty. */
  pop(): number {
    const { items, position } = this;
    const top = items[0];
    position[top] = -1;
    const last = items[--this.count];
    if (this.count > 0) {
      items[0] = last;
      position[last] = 0;
      this.siftDown(0);
    }
    return top;
  }

  private siftUp(start: number): void {
    const { items, position, key } = this;
    const item = items[start];
    const k = key[item];
    let at = start;
    while (at > 0) {
      const parent = (at - 1) >> 1;
      const above = items[parent];
      if (key[above] <= k) break;
      items[at] = above;
      position[above] = at;
      at = parent;
    }
    items[at] = item;
    position[item] = at;
  }

  private siftDown(start: number): void {
    const { items, position, key } = this;
    const n = this.count;
    const item = items[start];
    const k = key[item];
    let at = start;
    for (;;) {
      let child = 2 * at + 1;
      if (child >= n) break;
      if (child + 1 < n && key[items[child + 1]] < key[items[child]]) child++;
      const below = items[child];
      if (key[below] >= k) break;
      items[at] = below;
      position[below] = at;
      at = child;
    }
    items[at] = item;
    position[item] = at;
  }
}
