/**
 * TurnAdmission (src/lib/server/turn-admission.ts): at most `perTurn` requests start per turn of
 * the event loop, the others in arrival order, with nobody overtaking a request that waits.
 * The turns are driven by hand here: `atTurnEnd` collects the functions the event loop would run.
 */
import { describe, expect, it } from 'vitest';
import { TurnAdmission } from '../../src/lib/server/turn-admission';

function handTurns() {
  const pending: Array<() => void> = [];
  return {
    atTurnEnd: (run: () => void) => pending.push(run),
    /** Ends the turn: runs what was queued for its end (not what that queues for the next). */
    end: async () => {
      const now = pending.splice(0);
      for (const run of now) run();
      await Promise.resolve();
    },
    get queuedEnds() {
      return pending.length;
    },
  };
}

describe('TurnAdmission', () => {
  it('starts the first requests of a turn at once and the rest at later turns, in arrival order', async () => {
    const turns = handTurns();
    const admission = new TurnAdmission(2, turns.atTurnEnd);
    const started: number[] = [];
    for (let request = 1; request <= 5; request++) {
      const turn = admission.admit();
      if (turn === null) started.push(request);
      else void turn.then(() => started.push(request));
    }
    expect(started).toEqual([1, 2]);
    expect(admission.queued).toBe(3);
    await turns.end();
    expect(started).toEqual([1, 2, 3, 4]);
    await turns.end();
    expect(started).toEqual([1, 2, 3, 4, 5]);
    expect(admission.queued).toBe(0);
  });

  it('lets no new request overtake one that waits, even when the turn has room', async () => {
    const turns = handTurns();
    const admission = new TurnAdmission(1, turns.atTurnEnd);
    const order: string[] = [];
    expect(admission.admit()).toBeNull();
    void admission.admit()?.then(() => order.push('second'));
    await turns.end(); // the second starts at this turn's end, counting against the next turn
    void admission.admit()?.then(() => order.push('third'));
    expect(order).toEqual(['second']);
    await turns.end();
    expect(order).toEqual(['second', 'third']);
  });

  it('stops asking for turn ends once nothing waits and nothing started', async () => {
    const turns = handTurns();
    const admission = new TurnAdmission(3, turns.atTurnEnd);
    expect(admission.admit()).toBeNull();
    expect(turns.queuedEnds).toBe(1);
    await turns.end();
    expect(turns.queuedEnds).toBe(0);
    expect(admission.admit()).toBeNull();
    expect(turns.queuedEnds).toBe(1);
  });

  it('starts requests at the pace of the real event loop, a few per turn', async () => {
    const admission = new TurnAdmission(4);
    const startedAtTurn: number[] = [];
    let turn = 0;
    const ticking = setInterval(() => undefined, 1);
    const counter = () => setImmediate(() => {
      turn++;
      if (turn < 50) counter();
    });
    counter();
    await Promise.all(
      Array.from({ length: 20 }, async () => {
        const wait = admission.admit();
        if (wait) await wait;
        startedAtTurn.push(turn);
      }),
    );
    clearInterval(ticking);
    const perTurn = new Map<number, number>();
    for (const at of startedAtTurn) perTurn.set(at, (perTurn.get(at) ?? 0) + 1);
    expect(Math.max(...perTurn.values())).toBeLessThanOrEqual(4);
    expect(perTurn.size).toBeGreaterThanOrEqual(5);
  });
});
