/**
 * Every table in db/schema.ts is either bound into the audit chain (server/ledger-tables.ts) or
 * left out on purpose with a reason, and a chained table's newest canonical version names every
 * column it has: a new table or column cannot slip past the row ledger unnoticed (21 CFR 11.10(e):
 * the audit trail covers every change to the record).
 */
import { is } from 'drizzle-orm';
import { getTableConfig, SQLiteTable } from 'drizzle-orm/sqlite-core';
import * as schema from '../../db/schema';
import { CHAINED, EXEMPT } from '../../server/ledger-tables';

const tables = Object.values(schema).flatMap((v) => (is(v, SQLiteTable) ? [getTableConfig(v)] : []));

describe('the row ledger registry', () => {
  it.each(tables.map((t) => [t.name, t] as const))('%s is chained or exempt with a reason', (name, config) => {
    const chained = CHAINED[name];
    const exempt = EXEMPT[name];
    const line = `  ${name}: { key: ['id'], unit: 'unit_id', versions: [[${config.columns.map((c) => `'${c.name}'`).join(', ')}]] },`;
    if (!chained && !exempt) throw new Error(`${name} is neither in CHAINED nor in EXEMPT (server/ledger-tables.ts). To chain it, add:\n${line}`);
    expect(Boolean(chained) && Boolean(exempt)).toBe(false);
    if (exempt) {
      expect(exempt.length).toBeGreaterThan(20);
      return;
    }
    const columns = config.columns.map((c) => c.name).sort();
    const newest = [...chained!.versions.at(-1)!].sort();
    if (newest.join() !== columns.join()) {
      const missing = columns.filter((c) => !newest.includes(c));
      throw new Error(
        `${name}'s newest canonical version does not match its columns (missing: ${missing.join(', ') || 'none'}; extra: ${newest.filter((c) => !columns.includes(c)).join(', ') || 'none'}). Append a version, never edit an older one.`,
      );
    }
    for (const k of chained!.key) expect(columns).toContain(k);
    if (chained!.unit) expect(columns).toContain(chained!.unit);
  });

  it('lists no table that is not in the schema', () => {
    const names = new Set(tables.map((t) => t.name));
    expect([...Object.keys(CHAINED), ...Object.keys(EXEMPT)].filter((n) => !names.has(n))).toEqual([]);
  });

  it('only ever adds columns from one version to the next', () => {
    for (const [name, table] of Object.entries(CHAINED)) {
      table.versions.forEach((cols, i) => {
        if (i === 0) return;
        const previous = table.versions[i - 1]!;
        expect({ name, version: i + 1, dropped: previous.filter((c) => !cols.includes(c)) }).toEqual({ name, version: i + 1, dropped: [] });
      });
    }
  });
});
