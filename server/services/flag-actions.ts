/**
 * What was done about a flag: an action charted (idempotent by the client's id, a repeated tap
 * stored once), an action undone (marked entered in error, never deleted), and the flag's
 * history in words. Each takes typed input and the actor.
 */
import { and, desc, eq, getTableColumns, gte, isNull } from 'drizzle-orm';
import { writeTx } from '../../db/client';
import { actions, actionUndos, flagResolutions, flags, users } from '../../db/schema';
import type { CreateAction, UndoActionInput } from '../../shared/schemas/bedside';
import { appendAudit } from '../audit';
import type { AppContext } from '../context';
import { badRequest, conflict, notFound } from '../errors';
import { auditRead } from '../read-audit';
import { evaluationBody } from './charting';
import { appendFlagEvent } from './flag-lifecycle';
import { flagHistory } from './flag-history';
import { ruleKeyOf, syncFlags } from './flags';
import { assertActorUnit, type Actor } from './infants';
import { refreshPlacement } from './placement';

/** A second tap of the same action within this long stores nothing new. */
const REPEAT_TAP_MS = 60_000;

type Db = AppContext['database']['db'];

/** The flag with its unit, or 404; then 403 unless the actor belongs to the unit. */
function flagFor(db: Db, actor: Actor, flagId: string) {
  const flag = db
    .select({ id: flags.id, infantId: flags.infantId, unitId: flags.unitId, key: flags.key, raisedAt: flags.raisedAt, resolved: flagResolutions.flagId })
    .from(flags)
    .leftJoin(flagResolutions, eq(flagResolutions.flagId, flags.id))
    .where(eq(flags.id, flagId))
    .get();
  if (!flag) throw notFound('That flag');
  assertActorUnit(actor, flag.unitId);
  return flag;
}

function actionWithName(db: Db, id: string) {
  return db
    .select({ ...getTableColumns(actions), name: users.name })
    .from(actions)
    .innerJoin(users, eq(users.id, actions.recordedBy))
    .where(eq(actions.id, id))
    .get();
}

/** Something done about a flag. Idempotent by the client's id. */
export function recordAction(ctx: AppContext, flagId: string, input: CreateAction, actor: Actor) {
  const { sqlite, db } = ctx.database;
  const flag = flagFor(db, actor, flagId);
  const now = ctx.clock.now();
  const at = input.at ? new Date(input.at) : now;
  const loadAction = () => actionWithName(db, input.id);
  const same = (a: NonNullable<ReturnType<typeof loadAction>>) => {
    if (
      a.flagId !== flagId ||
      a.kind !== input.kind ||
      (a.note ?? null) !== (input.note || null) ||
      (a.probeSite ?? null) !== (input.probeSite ?? null) ||
      (input.at && a.at.getTime() !== at.getTime())
    ) {
      throw conflict('A different action was already saved with this id.', { id: 'This id belongs to another action.' });
    }
    return a;
  };
  if (!loadAction()) {
    if (flag.resolved) throw conflict('This flag has already closed.', { flag: 'Closed.' });
    if (at.getTime() > now.getTime() + 2 * 60_000) throw badRequest('The time is in the future.', { at: 'The time cannot be in the future.' });
    if (at.getTime() < flag.raisedAt.getTime()) throw badRequest('The time is before the flag was raised.', { at: 'The time is before the flag was raised.' });
  }
  const result = writeTx(sqlite, (): { created: boolean; sync: ReturnType<typeof syncFlags>; repeatOf?: string } => {
    if (loadAction()) return { created: false, sync: syncFlags(sqlite, flag.infantId, now, actor.userId) };
    // A second tap of the same action on the same flag by the same person within a short
    // window is the same action (common practice: one thing done, charted once).
    // (A move of the probe to another site is another action.)
    const repeat = db
      .select({ id: actions.id })
      .from(actions)
      .leftJoin(actionUndos, eq(actionUndos.actionId, actions.id))
      .where(
        and(
          eq(actions.flagId, flagId),
          eq(actions.kind, input.kind),
          eq(actions.recordedBy, actor.userId),
          gte(actions.createdAt, new Date(now.getTime() - REPEAT_TAP_MS)),
          input.probeSite ? eq(actions.probeSite, input.probeSite) : isNull(actions.probeSite),
          // "Something else" is its note: another note is another thing done.
          input.kind === 'other' ? eq(actions.note, input.note ?? '') : undefined,
          isNull(actionUndos.id),
        ),
      )
      .orderBy(desc(actions.createdAt))
      .limit(1)
      .get();
    if (repeat) return { created: false, sync: syncFlags(sqlite, flag.infantId, now, actor.userId), repeatOf: repeat.id };
    db.insert(actions)
      .values({
        id: input.id,
        flagId,
        infantId: flag.infantId,
        unitId: flag.unitId,
        kind: input.kind,
        note: input.note || null,
        at,
        recordedBy: actor.userId,
        createdAt: now,
        probeSite: input.probeSite ?? null,
      })
      .run();
    appendAudit(sqlite, {
      at: now,
      actorId: actor.userId,
      action: 'flag-action',
      entityType: 'action',
      entityId: input.id,
      unitId: flag.unitId,
      after: { flagId, flagKey: flag.key, kind: input.kind, note: input.note ?? null, at: at.toISOString(), ...(input.probeSite ? { probeSite: input.probeSite } : {}) },
    });
    appendFlagEvent(db, {
      flagId,
      infantId: flag.infantId,
      unitId: flag.unitId,
      event: 'action',
      at,
      actorId: actor.userId,
      detail: { actionId: input.id, kind: input.kind, ...(input.probeSite ? { probeSite: input.probeSite } : {}) },
      now,
    });
    // Moving the probe charts its new site as the current placement.
    if (input.probeSite) refreshPlacement(sqlite, flag.infantId, flag.unitId, now);
    return { created: true, sync: syncFlags(sqlite, flag.infantId, now, actor.userId) };
  });
  const a = result.repeatOf ? actionWithName(db, result.repeatOf)! : same(loadAction()!);
  const evaluated = result.sync.evaluation.flags.find((f) => f.key === ruleKeyOf(flag.key));
  return {
    action: { id: a.id, flagId: a.flagId, kind: a.kind, note: a.note, at: a.at.toISOString(), recordedBy: { id: a.recordedBy, name: a.name }, probeSite: a.probeSite },
    created: result.created,
    flag: evaluated
      ? {
          id: flagId,
          key: flag.key,
          status: evaluated.status,
          recheckDueAt: evaluated.recheckDueAt ? evaluated.recheckDueAt.toISOString() : null,
          recheckCountsFrom: evaluated.recheckCountsFrom ? evaluated.recheckCountsFrom.toISOString() : null,
        }
      : { id: flagId, key: flag.key, status: 'closed', recheckDueAt: null, recheckCountsFrom: null },
    ...evaluationBody(ctx, flag.infantId, result.sync),
  };
}

/**
 * Undo a mistaken action: an action_undos row marks it entered in error (the action stays on
 * record). The rules run again without it; when the action had let a recheck close the flag,
 * the flag reopens (a `reopened` event). Idempotent: undoing an undone action answers with the
 * first undo.
 */
export function undoAction(ctx: AppContext, flagId: string, actionId: string, input: UndoActionInput, actor: Actor) {
  const { sqlite, db } = ctx.database;
  flagFor(db, actor, flagId);
  const action = db
    .select({ id: actions.id, infantId: actions.infantId, unitId: actions.unitId, kind: actions.kind })
    .from(actions)
    .where(and(eq(actions.id, actionId), eq(actions.flagId, flagId)))
    .get();
  if (!action) throw notFound('That action');
  const now = ctx.clock.now();
  const result = writeTx(sqlite, () => {
    const done = db.select({ id: actionUndos.id }).from(actionUndos).where(eq(actionUndos.actionId, actionId)).get();
    if (done) return { created: false, undoId: done.id, sync: syncFlags(sqlite, action.infantId, now, actor.userId) };
    db.insert(actionUndos)
      .values({ id: input.id, actionId, flagId, infantId: action.infantId, unitId: action.unitId, undoneBy: actor.userId, note: input.note || null, at: now, createdAt: now })
      .run();
    appendAudit(sqlite, {
      at: now,
      actorId: actor.userId,
      action: 'flag-action-undone',
      entityType: 'action',
      entityId: actionId,
      unitId: action.unitId,
      after: { undoId: input.id, flagId, kind: action.kind, note: input.note ?? null },
    });
    appendFlagEvent(db, {
      flagId,
      infantId: action.infantId,
      unitId: action.unitId,
      event: 'action-undone',
      at: now,
      actorId: actor.userId,
      detail: { actionId, kind: action.kind },
      now,
    });
    // An undone move of the probe no longer says where the probe is.
    if (action.kind === 'moved-probe') refreshPlacement(sqlite, action.infantId, action.unitId, now);
    return { created: true, undoId: input.id, sync: syncFlags(sqlite, action.infantId, now, actor.userId) };
  });
  return {
    undo: { id: result.undoId, actionId, flagId },
    created: result.created,
    reopenedFlagIds: result.sync.raised,
    ...evaluationBody(ctx, action.infantId, result.sync),
  };
}

/** A flag's lifecycle in words (and its earlier rows when it was reopened), oldest first; the read is audited. */
export async function readFlagHistory(ctx: AppContext, flagId: string, actor: Actor) {
  const { sqlite, db } = ctx.database;
  const flag = flagFor(db, actor, flagId);
  const events = flagHistory(sqlite, flagId);
  await auditRead(sqlite, {
    at: ctx.clock.now(),
    actorId: actor.userId,
    action: 'chart-read',
    entityType: 'flag',
    entityId: flagId,
    unitId: flag.unitId,
    after: { view: 'flag-history', infantId: flag.infantId },
  });
  return { flagId, events };
}
