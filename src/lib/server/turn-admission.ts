/**
 * Requests started per turn of the event loop, the others waiting in arrival order.
 *
 * Node 20's server accepts one waiting connection per turn of its event loop once the loop is
 * busy, and a turn runs every request whose bytes arrived before it, each to its end. With 50
 * readers connecting at once, a turn grew to hundreds of milliseconds and the last connections
 * were accepted after 8-10 s (docs/decisions/025-reader-latency.md). Starting at most a few
 * requests per turn keeps turns short, so connections are accepted as they come, and requests are
 * served in the order they arrived: the wait is the work ahead, not the luck of a turn's edge.
 */

/** Starts at most `perTurn` requests per turn of the event loop. */
export class TurnAdmission {
  private startedThisTurn = 0;
  private turnEndQueued = false;
  private readonly waiting: Array<() => void> = [];

  /**
   * @param perTurn requests started per turn (at least 1).
   * @param atTurnEnd runs a function after this turn's input and output (setImmediate).
   */
  constructor(
    private readonly perTurn: number,
    private readonly atTurnEnd: (run: () => void) => void = setImmediate,
  ) {}

  /**
   * Waits for the request's turn.
   * @returns null when it may start now, else a promise that resolves at its turn.
   */
  admit(): Promise<void> | null {
    this.queueTurnEnd();
    if (this.waiting.length === 0 && this.startedThisTurn < this.perTurn) {
      this.startedThisTurn++;
      return null;
    }
    return new Promise((resolve) => this.waiting.push(resolve));
  }

  /** Requests waiting for a turn. */
  get queued(): number {
    return this.waiting.length;
  }

  private queueTurnEnd(): void {
    if (this.turnEndQueued) return;
    this.turnEndQueued = true;
    this.atTurnEnd(() => {
      this.turnEndQueued = false;
      this.startedThisTurn = 0;
      while (this.startedThisTurn < this.perTurn && this.waiting.length > 0) {
        this.startedThisTurn++;
        (this.waiting.shift() as () => void)();
      }
      if (this.waiting.length > 0 || this.startedThisTurn > 0) this.queueTurnEnd();
    });
  }
}
