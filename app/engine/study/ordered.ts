/**
 * Finished cases back in case order. Workers finish cases out of order; the table is written in
 * case order, so a case waits here until every case before it has arrived. The queue hands out
 * chunks in case order, so few wait at a time (about workers × chunk size).
 */
import type { CaseRecord } from './runCase';

export class CaseOrderer {
  private next: number;
  private readonly waiting = new Map<number, CaseRecord>();

  /** `first`: the first case index expected (0, or a shard's first case). */
  constructor(first: number) {
    this.next = first;
  }

  /** Take a finished case; returns the cases now ready, in order (possibly none). */
  push(rec: CaseRecord): CaseRecord[] {
    this.waiting.set(rec.draw.index, rec);
    const out: CaseRecord[] = [];
    for (let r = this.waiting.get(this.next); r !== undefined; r = this.waiting.get(this.next)) {
      this.waiting.delete(this.next);
      out.push(r);
      this.next++;
    }
    return out;
  }

  /** Cases waiting for an earlier one. */
  get pending(): number {
    return this.waiting.size;
  }

  /** Everything still waiting, in case order (a study stopped early has gaps). */
  drain(): CaseRecord[] {
    const out = [...this.waiting.values()].sort((a, b) => a.draw.index - b.draw.index);
    this.waiting.clear();
    return out;
  }
}
