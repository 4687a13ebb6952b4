/**
 * "Something else (see note)": an action whose note says what was done, through the real app on
 * a real SQLite file. Common practice: a chart entry of something done says what was done.
 */
import { randomUUID } from 'node:crypto';
import type { TestEnv } from './helpers';
import type { Ward } from './clinical-views';
import { wardSuite } from './flag-ward';

const suite = wardSuite();
let env: TestEnv;
let ward: Ward;
beforeAll(() => {
  env = suite.env;
  ward = suite.ward;
});

async function gapFlag() {
  const id = await ward.admit();
  suite.admitted.push(id);
  const raised = await ward.chart(id, { probe: 37.3, remote: 36.6 });
  const gap = raised.body.openFlags.find((f: { kind: string }) => f.kind === 'gap') as { id: string };
  return { infantId: id, flagId: gap.id };
}

const count = (flagId: string) => (env.app.context.database.sqlite.prepare('SELECT COUNT(*) AS n FROM actions WHERE flag_id = ?').get(flagId) as { n: number }).n;

describe('something else, with its note', () => {
  it('is refused without a note, or with only spaces, naming the note; nothing is stored', async () => {
    const { flagId } = await gapFlag();
    for (const note of [undefined, null, '', '   ']) {
      const res = await ward.call('nurse', 'post', `/flags/${flagId}/actions`, { id: randomUUID(), kind: 'other', ...(note === undefined ? {} : { note }) });
      expect(res.status).toBe(400);
      expect(res.body.error.fields.note).toBe('Say what was done.');
    }
    expect(count(flagId)).toBe(0);
  });

  it('is stored with its note and shown on the flowsheet with it', async () => {
    const { infantId, flagId } = await gapFlag();
    const res = await ward.ok('nurse', 'post', `/flags/${flagId}/actions`, { id: randomUUID(), kind: 'other', note: 'Warmed the hands before handling.' });
    expect(res.status).toBe(201);
    expect(res.body.action).toMatchObject({ kind: 'other', note: 'Warmed the hands before handling.' });
    const sheet = await ward.ok('nurse', 'get', `/infants/${infantId}/flowsheet?hours=12`);
    const flag = (sheet.body.flags as { id: string; actions: { kind: string; note: string | null }[] }[]).find((f) => f.id === flagId)!;
    expect(flag.actions).toEqual([expect.objectContaining({ kind: 'other', note: 'Warmed the hands before handling.' })]);
  });

  it('two different notes within a minute are two things done; the same note tapped twice is one', async () => {
    const { flagId } = await gapFlag();
    const first = await ward.ok('nurse', 'post', `/flags/${flagId}/actions`, { id: randomUUID(), kind: 'other', note: 'Closed the incubator portholes.' });
    env.clock.advanceMinutes(0.25);
    const other = await ward.ok('nurse', 'post', `/flags/${flagId}/actions`, { id: randomUUID(), kind: 'other', note: 'Put a hat on.' });
    expect(other.status).toBe(201);
    env.clock.advanceMinutes(0.25);
    const again = await ward.ok('nurse', 'post', `/flags/${flagId}/actions`, { id: randomUUID(), kind: 'other', note: 'Put a hat on.' });
    expect(again.status).toBe(200);
    expect(again.body.action.id).toBe(other.body.action.id);
    expect(first.body.action.id).not.toBe(other.body.action.id);
    expect(count(flagId)).toBe(2);
  });
});
