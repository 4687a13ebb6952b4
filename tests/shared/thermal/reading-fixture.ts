import type { ReadingInput } from '../../../shared/thermal';

/** Minutes after `t0` as an instant. */
export const minutesAfter = (t0: Date) => (minutes: number) => new Date(t0.getTime() + minutes * 60_000);

/** A reading taken (and recorded) `minutes` after `t0`, nothing charted but `values`. */
export function readingAfter(t0: Date, id: string, minutes: number, values: Partial<ReadingInput> = {}): ReadingInput {
  const at = minutesAfter(t0)(minutes);
  return {
    id,
    takenAt: at,
    probeCenti: null,
    remoteCenti: null,
    remoteSite: null,
    airCenti: null,
    setCenti: null,
    controlMode: null,
    heaterOutputPct: null,
    heartRate: null,
    heatSigns: [],
    replacesId: null,
    enteredInError: false,
    recordedAt: at,
    ...values,
  };
}
