/**
 * How full the likelihood calls of a run were: the number of calls of each batch size. It gives
 * the mean points per call and the speed-up that `threads` equally fast threads would reach if
 * every point cost the same (a call of b points takes ceil(b / threads) point-times instead of b),
 * a deterministic stand-in for wall-clock speed-ups on a busy machine.
 */
export class BatchOccupancy {
  private readonly callsOfSize = new Map<number, number>();
  calls = 0;
  points = 0;

  record(count: number): void {
    this.calls++;
    this.points += count;
    this.callsOfSize.set(count, (this.callsOfSize.get(count) ?? 0) + 1);
  }

  /** Mean points per likelihood call. */
  meanPoints(): number {
    return this.calls > 0 ? this.points / this.calls : 0;
  }

  /** Points over point-times on `threads` threads, when every point costs the same. */
  idealSpeedUp(threads: number): number {
    let waves = 0;
    for (const [size, calls] of this.callsOfSize) waves += calls * Math.ceil(size / threads);
    return waves > 0 ? this.points / waves : 1;
  }
}
