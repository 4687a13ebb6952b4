import { prepared } from '../db/client';
import { createHash } from 'node:crypto';
import type Database from 'better-sqlite3';

export const GENESIS_HASH = '0'.repeat(64);

export interface AuditInput {
  at: Date;
  actorId: string | null;
  action: string;
  entityType: string;
  entityId: string | null;
  unitId: string | null;
  before?: unknown;
  after?: unknown;
}

const json = (v: unknown) => (v === undefined || v === null ? null : JSON.stringify(v));

/** The hash covers every field of the event and the previous hash, in a fixed order. */
export function auditHash(prevHash: string, e: { at: number; actorId: string | null; action: string; entityType: string; entityId: string | null; unitId: string | null; before: string | null; after: string | null }): string {
  const canonical = JSON.stringify([prevHash, e.at, e.actorId, e.action, e.entityType, e.entityId, e.unitId, e.before, e.after]);
  return createHash('sha256').update(canonical).digest('hex');
}

/**
 * Append one audit event. Call inside the same write transaction as the change it records,
 * so the change and its audit event are stored together or not at all.
 */
export function appendAudit(sqlite: Database.Database, input: AuditInput): void {
  const last = prepared(sqlite, 'SELECT hash FROM audit_events ORDER BY id DESC LIMIT 1').get() as { hash: string } | undefined;
  const prevHash = last?.hash ?? GENESIS_HASH;
  const row = {
    at: input.at.getTime(),
    actorId: input.actorId,
    action: input.action,
    entityType: input.entityType,
    entityId: input.entityId,
    unitId: input.unitId,
    before: json(input.before),
    after: json(input.after),
  };
  const hash = auditHash(prevHash, row);
  prepared(
    sqlite,
      'INSERT INTO audit_events (at, actor_id, action, entity_type, entity_id, unit_id, before, after, prev_hash, hash) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    )
    .run(row.at, row.actorId, row.action, row.entityType, row.entityId, row.unitId, row.before, row.after, prevHash, hash);
}

export interface ChainReport {
  ok: boolean;
  checked: number;
  firstBrokenId: number | null;
  reason: string | null;
}

/** Walk the whole chain; report the first event whose link or content does not match. */
export function verifyAuditChain(sqlite: Database.Database): ChainReport {
  const rows = sqlite
    .prepare('SELECT id, at, actor_id AS actorId, action, entity_type AS entityType, entity_id AS entityId, unit_id AS unitId, before, after, prev_hash AS prevHash, hash FROM audit_events ORDER BY id')
    .iterate() as IterableIterator<{ id: number; at: number; actorId: string | null; action: string; entityType: string; entityId: string | null; unitId: string | null; before: string | null; after: string | null; prevHash: string; hash: string }>;
  let prev = GENESIS_HASH;
  let checked = 0;
  for (const row of rows) {
    checked += 1;
    if (row.prevHash !== prev) return { ok: false, checked, firstBrokenId: row.id, reason: 'the link to the previous event does not match' };
    if (auditHash(prev, row) !== row.hash) return { ok: false, checked, firstBrokenId: row.id, reason: 'the event was changed after it was written' };
    prev = row.hash;
  }
  return { ok: true, checked, firstBrokenId: null, reason: null };
}
