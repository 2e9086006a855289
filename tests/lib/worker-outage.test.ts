// The worker's outage guard (lib/jobs/outage.ts): which errors mean the database is away, and one
// pause and one resume per outage.
import { describe, expect, it, vi } from 'vitest';
import { isDatabaseUnreachable, outageGuard } from '@/lib/jobs/outage';

const refused = Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:5432'), { code: 'ECONNREFUSED' });
const shutdown = Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' });

describe('isDatabaseUnreachable', () => {
  it('knows pg errors as pg-boss passes them on (SQLSTATE class 08 and 57P0x, socket codes; PostgreSQL docs, Appendix A)', () => {
    expect(isDatabaseUnreachable(refused)).toBe(true);
    expect(isDatabaseUnreachable(shutdown)).toBe(true);
    expect(isDatabaseUnreachable(Object.assign(new Error('x'), { code: '08006' }))).toBe(true);
    expect(isDatabaseUnreachable(new Error('Connection terminated unexpectedly (Queue: mail, Worker: 1)'))).toBe(true);
    expect(isDatabaseUnreachable(new AggregateError([refused], ''))).toBe(true);
  });
  it('leaves ordinary failures alone', () => {
    expect(isDatabaseUnreachable(Object.assign(new Error('duplicate key'), { code: '23505' }))).toBe(false);
    expect(isDatabaseUnreachable(new Error('Greeting never received'))).toBe(false);
    expect(isDatabaseUnreachable(null)).toBe(false);
  });
});

describe('outageGuard', () => {
  it('pauses once per outage, probes until the database answers, resumes once', async () => {
    vi.useFakeTimers();
    const pause = vi.fn(async () => {});
    const resume = vi.fn(async () => {});
    let up = false;
    const probe = vi.fn(async () => {
      if (!up) throw refused;
    });
    const g = outageGuard({ pause, resume, probe, everyMs: 1000 });
    expect(g.report(new Error('some bug'))).toBe(false);
    expect(g.report(refused)).toBe(true);
    expect(g.report(shutdown)).toBe(true);
    expect(g.paused()).toBe(true);
    await vi.advanceTimersByTimeAsync(3500);
    expect(pause).toHaveBeenCalledTimes(1);
    expect(probe.mock.calls.length).toBeGreaterThanOrEqual(3);
    expect(resume).not.toHaveBeenCalled();
    up = true;
    await vi.advanceTimersByTimeAsync(1000);
    expect(resume).toHaveBeenCalledTimes(1);
    expect(g.paused()).toBe(false);
    g.close();
    vi.useRealTimers();
  });
});
