// How many unexpected server stops are answered with a restart: at most `limit` within a sliding
// window, so a server that crashes on every start is not restarted for ever.

export class RestartBudget {
  private restarts: number[] = [];

  constructor(
    readonly limit = 4,
    readonly windowMs = 3 * 60_000,
  ) {}

  /** Records a stop at `now` (ms); true when a restart is still within the budget. */
  allowRestart(now: number): boolean {
    this.restarts = this.restarts.filter((time) => now - time < this.windowMs);
    if (this.restarts.length >= this.limit) return false;
    this.restarts.push(now);
    return true;
  }

  /** Restarts counted in the current window. */
  get used(): number {
    return this.restarts.length;
  }

  /** A deliberate restart by the user starts a fresh budget. */
  reset(): void {
    this.restarts = [];
  }
}
