/**
 * Undo of a mistaken action and the repeated tap, through the real app on a real SQLite file.
 * Undoing an action that let a recheck close a gap reopens the gap (common practice: a gap closes
 * only on a recheck after something was done about it); every view is compared with the
 * independent reference model (tests/reference).
 */
import { randomUUID } from 'node:crypto';
import { evaluateModel } from '../reference/thermal-model';
import { differences, modelView, Ward } from './clinical-views';
import type { TestEnv } from './helpers';
import { wardSuite } from './flag-ward';

const suite = wardSuite();
let env: TestEnv;
let ward: Ward;
const admitted = suite.admitted;
beforeAll(() => {
  env = suite.env;
  ward = suite.ward;
});

async function admit() {
  const id = await ward.admit();
  admitted.push(id);
  return id;
}

const openKinds = async (id: string) => ((await ward.ok('nurse', 'get', `/infants/${id}`)).body.infant.openFlags as { kind: string }[]).map((f) => f.kind).sort();
const events = (infantId: string) =>
  env.app.context.database.sqlite.prepare('SELECT flag_id, event, detail FROM flag_events WHERE infant_id = ? ORDER BY created_at, rowid').all(infantId) as {
    flag_id: string;
    event: string;
    detail: string;
  }[];

describe('undo a mistaken action', () => {
  it('undoing the action that let a recheck close a gap reopens the gap everywhere, with a reopened event; the action stays on record (common practice)', async () => {
    const id = await admit();
    const raised = await ward.chart(id, { probe: 37.3, remote: 36.6 });
    const gap = raised.body.openFlags.find((f: { kind: string }) => f.kind === 'gap');
    ward.advance(2);
    const act = await ward.act(id, gap.id, gap.key);
    ward.advance(20);
    await ward.chart(id, { probe: 36.8, remote: 36.9 });
    expect(await openKinds(id)).not.toContain('gap');
    ward.advance(3);
    const undo = await ward.ok('nurse', 'post', `/flags/${gap.id}/actions/${act.body.action.id}/undo`, { id: randomUUID(), note: 'Tapped on the wrong infant.' });
    expect(undo.status).toBe(201);
    // The model is told the action never happened.
    const h = ward.histories.get(id)!;
    h.actions.splice(
      h.actions.findIndex((a) => a.flagKey === gap.key),
      1,
    );
    expect(await openKinds(id)).toContain('gap');
    const views = await ward.views(id);
    const model = modelView(ward, id, evaluateModel);
    expect(views.flatMap((v) => differences(v, model))).toEqual([]);
    const reopened = events(id).filter((e) => e.event === 'reopened');
    expect(reopened.map((e) => JSON.parse(e.detail).previousFlagId)).toEqual([gap.id]);
    expect(events(id).some((e) => e.event === 'action-undone' && JSON.parse(e.detail).actionId === act.body.action.id)).toBe(true);
    const kept = env.app.context.database.sqlite.prepare('SELECT id FROM actions WHERE id = ?').get(act.body.action.id);
    expect(kept).toBeDefined();
    // Undoing again answers with the first undo and changes nothing.
    const again = await ward.ok('nurse', 'post', `/flags/${gap.id}/actions/${act.body.action.id}/undo`, { id: randomUUID() });
    expect(again.status).toBe(200);
    expect(again.body.undo.id).toBe(undo.body.undo.id);
    expect(events(id).filter((e) => e.event === 'reopened')).toHaveLength(1);
  });

  it("a flag's history reads in words, across its reopening, and is refused to another unit's reader (common practice: the record says who did what and when)", async () => {
    const id = await admit();
    const raised = await ward.chart(id, { probe: 37.3, remote: 36.6 });
    const gap = raised.body.openFlags.find((f: { kind: string }) => f.kind === 'gap');
    ward.advance(2);
    const act = await ward.act(id, gap.id, gap.key);
    ward.advance(20);
    await ward.chart(id, { probe: 36.8, remote: 36.9 });
    ward.advance(3);
    const undo = await ward.ok('nurse', 'post', `/flags/${gap.id}/actions/${act.body.action.id}/undo`, { id: randomUUID() });
    const reopenedId = undo.body.reopenedFlagIds[0] as string;
    const history = (await ward.ok('nurse', 'get', `/flags/${reopenedId}/history`)).body.events as { text: string; by: { name: string } | null }[];
    const texts = history.map((e) => e.text);
    expect(texts[0]).toMatch(/^Raised/);
    expect(texts.some((t) => /^Action: [A-Z]/.test(t))).toBe(true);
    expect(texts.some((t) => /^Closed by a recheck/.test(t))).toBe(true);
    expect(texts.some((t) => /^Action undone/.test(t))).toBe(true);
    expect(texts[texts.length - 1]).toMatch(/^Reopened/);
    // Words, never internal codes.
    expect(texts.join(' ')).not.toMatch(/gap:|reading-corrected|check-recorded|severity-changed/);
    expect(history.find((e) => /^Action undone/.test(e.text))!.by).toMatchObject({ name: expect.any(String) });
    // "Something else" says what in its note, and the history shows the note (common practice: an action charted without what was done says nothing).
    ward.advance(1);
    await ward.ok('nurse', 'post', `/flags/${reopenedId}/actions`, { id: randomUUID(), kind: 'other', note: 'Closed the porthole left open after a cares round.' });
    const after = (await ward.ok('nurse', 'get', `/flags/${reopenedId}/history`)).body.events as { text: string }[];
    expect(after[after.length - 1].text).toBe('Action: Something else (see note). Note: Closed the porthole left open after a cares round.');
  });

  it('an undo from another unit is refused, and a bad note says which field (common practice)', async () => {
    const id = await admit();
    const raised = await ward.chart(id, { probe: 37.3, remote: 36.6 });
    const gap = raised.body.openFlags.find((f: { kind: string }) => f.kind === 'gap');
    const act = await ward.act(id, gap.id, gap.key);
    const bad = await ward.call('nurse', 'post', `/flags/${gap.id}/actions/${act.body.action.id}/undo`, { id: randomUUID(), note: 'x'.repeat(301) });
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body)).toMatch(/note/);
    const educator = await ward.call('educator', 'post', `/flags/${gap.id}/actions/${act.body.action.id}/undo`, { id: randomUUID() });
    expect(educator.status).toBe(403);
    const missing = await ward.call('nurse', 'post', `/flags/${gap.id}/actions/${randomUUID()}/undo`, { id: randomUUID() });
    expect(missing.status).toBe(404);
  });
});

describe('a repeated tap', () => {
  it('the same action tapped twice on the same flag within a minute is stored once (common practice: one thing done is charted once)', async () => {
    const id = await admit();
    const raised = await ward.chart(id, { probe: 37.3, remote: 36.6 });
    const gap = raised.body.openFlags.find((f: { kind: string }) => f.kind === 'gap');
    const first = await ward.ok('nurse', 'post', `/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'checked-probe-contact' });
    ward.env.clock.advanceMinutes(0.25);
    const second = await ward.ok('nurse', 'post', `/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'checked-probe-contact' });
    expect(first.status).toBe(201);
    expect(second.status).toBe(200);
    expect(second.body.action.id).toBe(first.body.action.id);
    const count = env.app.context.database.sqlite.prepare('SELECT COUNT(*) AS n FROM actions WHERE flag_id = ?').get(gap.id) as { n: number };
    expect(count.n).toBe(1);
    // Two minutes later it is a new action.
    ward.advance(2);
    const later = await ward.ok('nurse', 'post', `/flags/${gap.id}/actions`, { id: randomUUID(), kind: 'checked-probe-contact' });
    expect(later.status).toBe(201);
  });
});
