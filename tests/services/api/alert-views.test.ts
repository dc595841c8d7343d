import { ALERT_SELF_CLOSER, type Alert, type VehicleResult } from '@thermargin/shared';
import { describe, expect, it } from 'vitest';
import { alertViews, isOpenAlert } from '../../../services/api/src/views.ts';

const alert = (time: string, status: Alert['status']): Alert => ({
  time,
  status,
  cause: status === 'ok' ? 'none' : 'fouling',
  detail: `${status} at ${time}`,
});
const result = (alerts: Alert[]) => ({ id: 'bus-01', trips: [], alerts }) as unknown as VehicleResult;

describe('alerts close themselves when superseded, and a return to ok needs no acknowledgement', () => {
  it('leaves only the newest alert open, the others closed with the reason', () => {
    const views = alertViews(
      'bus-01',
      result([alert('2026-07-01T08:00:00Z', 'watch'), alert('2026-07-03T09:30:00Z', 'inspect')]),
      [],
    );
    expect(views.map((v) => v.state)).toEqual(['closed', 'open']);
    expect(views[0]!.closed).toEqual({
      by: ALERT_SELF_CLOSER,
      at: '2026-07-03T09:30:00Z',
      note: 'superseded by the inspect alert of 2026-07-03 09:30 UTC',
    });
    expect(views.filter(isOpenAlert)).toHaveLength(1);
  });

  it('an ok alert is closed from the start, and closes the ones before it', () => {
    const views = alertViews(
      'bus-01',
      result([alert('2026-07-01T08:00:00Z', 'watch'), alert('2026-07-05T10:00:00Z', 'ok')]),
      [],
    );
    expect(views.map((v) => v.state)).toEqual(['closed', 'closed']);
    expect(views[0]!.closed!.note).toBe('superseded: the vehicle went back to ok');
    expect(views[1]!.closed!.note).toMatch(/nothing to acknowledge/);
    expect(views.filter(isOpenAlert)).toEqual([]);
  });

  it('a person’s close stays theirs; an acknowledged newest alert stays acknowledged', () => {
    const alerts = [alert('2026-07-01T08:00:00Z', 'watch'), alert('2026-07-03T09:30:00Z', 'inspect')];
    const first = alertViews('bus-01', result(alerts), []);
    const actions = [
      { vehicle: 'bus-01', alert: first[0]!.id, action: 'close', by: 'ana', at_ms: 1, note: 'cleaned' },
      { vehicle: 'bus-01', alert: first[1]!.id, action: 'acknowledge', by: 'ana', at_ms: 2, note: 'booked' },
    ] as Parameters<typeof alertViews>[2];
    const views = alertViews('bus-01', result(alerts), actions);
    expect(views[0]!.closed!.by).toBe('ana');
    expect(views[1]!.state).toBe('acknowledged');
  });
});
