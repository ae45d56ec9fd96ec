import { describe, expect, it } from 'vitest';
import { RestartBudget } from '../../client/src/restartBudget';

describe('RestartBudget', () => {
  it('allows `limit` restarts within the window and refuses the next', () => {
    const budget = new RestartBudget(3, 1000);
    expect([0, 10, 20].map((t) => budget.allowRestart(t))).toEqual([true, true, true]);
    expect(budget.allowRestart(30)).toBe(false);
    expect(budget.used).toBe(3);
  });

  it('forgets restarts older than the window', () => {
    const budget = new RestartBudget(2, 1000);
    expect(budget.allowRestart(0)).toBe(true);
    expect(budget.allowRestart(500)).toBe(true);
    expect(budget.allowRestart(900)).toBe(false);
    // At t = 1000 the stop at t = 0 has left the window: one slot is free again.
    expect(budget.allowRestart(1000)).toBe(true);
    expect(budget.allowRestart(1001)).toBe(false);
  });

  it('starts afresh after a deliberate restart', () => {
    const budget = new RestartBudget(1, 60_000);
    expect(budget.allowRestart(0)).toBe(true);
    expect(budget.allowRestart(1)).toBe(false);
    budget.reset();
    expect(budget.used).toBe(0);
    expect(budget.allowRestart(2)).toBe(true);
  });
});
