/** The rules alone: evaluateInfant over each infant's whole stay, with the data already in memory. */
import Database from 'better-sqlite3';
import { loadInfantState, loadUnitRow, policyForUnit } from '../server/services/flags';
import { evaluateInfant } from '../shared/thermal';

export interface RulesFigures {
  infants: number;
  readings: number;
  /** Best of the rounds, for all infants together. */
  totalMs: number;
  medianMs: number;
  perInfantMs: number;
  rounds: number;
}

export function benchRules(file: string, unitId: string, infantIds: string[], rounds: number, now = new Date()): RulesFigures {
  const sqlite = new Database(file, { readonly: true });
  try {
    const policy = policyForUnit(loadUnitRow(sqlite, unitId)!);
    const states = infantIds.map((id) => loadInfantState(sqlite, id));
    const readings = states.reduce((sum, s) => sum + s.readings.length, 0);
    // One unmeasured round lets V8 optimise the rules first, as a running server would have.
    for (const s of states) evaluateInfant(s, now, policy);
    const times: number[] = [];
    for (let r = 0; r < rounds; r++) {
      const t = performance.now();
      for (const s of states) evaluateInfant(s, now, policy);
      times.push(performance.now() - t);
    }
    times.sort((a, b) => a - b);
    return {
      infants: states.length,
      readings,
      totalMs: times[0]!,
      medianMs: times[Math.floor(times.length / 2)]!,
      perInfantMs: times[0]! / states.length,
      rounds,
    };
  } finally {
    sqlite.close();
  }
}
