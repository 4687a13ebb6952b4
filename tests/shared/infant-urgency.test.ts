import { byUrgency } from '../../shared/infant-urgency';
import type { InfantSummary, OpenFlagSummary } from '../../shared/types/bedside';

/**
 * My infants in order of urgency, from the stored severities and clocks the server sends. The
 * order (the most severe open flag first, then an overdue check, then the soonest check, then the
 * bed) is common practice for a shift's list; the severities come with each flag.
 */

const T0 = Date.parse('2026-11-16T10:00:00Z');
const at = (minutes: number) => new Date(T0 + minutes * 60_000).toISOString();

function infant(bed: string, opts: { flags?: Partial<OpenFlagSummary>[]; status?: InfantSummary['nextCheck']['status']; dueIn?: number | null } = {}) {
  const dueAt = opts.dueIn === null || opts.dueIn === undefined ? null : at(opts.dueIn);
  return {
    bedLabel: bed,
    displayName: `Baby ${bed}`,
    openFlags: (opts.flags ?? []).map((f, i) => ({ id: `f${i}`, key: `k${i}`, kind: 'gap', raisedAt: at(-30), detail: {}, recheckDueAt: null, ...f }) as OpenFlagSummary),
    nextCheck: { status: opts.status ?? 'ok', dueAt, minutesLate: 0 },
  };
}

const beds = (list: { bedLabel: string | null }[]) => list.map((i) => i.bedLabel);

describe('My infants by urgency', () => {
  it('puts the most severe open flag first, whatever the bed', () => {
    const list = [
      infant('N01', { dueIn: 200 }),
      infant('N02', { flags: [{ kind: 'cold-stress', severity: 'caution' }], dueIn: 200 }),
      infant('N03', { flags: [{ kind: 'gap', severity: 'urgent' }], dueIn: 200 }),
      infant('N04', {
        flags: [
          { kind: 'gap', severity: 'urgent' },
          { kind: 'fever', severity: 'critical' },
        ],
        dueIn: 200,
      }),
    ];
    expect(beds(byUrgency(list))).toEqual(['N04', 'N03', 'N02', 'N01']);
  });

  it('then an overdue check (longest overdue first), a never-checked infant, then the soonest check', () => {
    const list = [
      infant('N01', { status: 'ok', dueIn: 120 }),
      infant('N02', { status: 'due-soon', dueIn: 10 }),
      infant('N03', { status: 'overdue', dueIn: -5 }),
      infant('N04', { status: 'overdue', dueIn: -40 }),
      infant('N05', { status: 'never', dueIn: null }),
      infant('N06', { status: 'ok', dueIn: 60 }),
    ];
    expect(beds(byUrgency(list))).toEqual(['N04', 'N03', 'N05', 'N02', 'N06', 'N01']);
  });

  it('falls back to the bed in natural order (N2 before N10), an infant without a bed last', () => {
    const list = [infant('N10', { dueIn: 60 }), { ...infant('X', { dueIn: 60 }), bedLabel: null }, infant('N2', { dueIn: 60 })];
    expect(beds(byUrgency(list))).toEqual(['N2', 'N10', null]);
  });

  it('reads the stored severity, not the kind: a cold-stress flag stored as critical comes first', () => {
    const list = [
      infant('N01', { flags: [{ kind: 'gap', severity: 'urgent' }] }),
      infant('N02', { flags: [{ kind: 'cold-stress', severity: 'critical', detail: { band: 'severe-hypothermia' } }] }),
    ];
    expect(beds(byUrgency(list))).toEqual(['N02', 'N01']);
  });
});
