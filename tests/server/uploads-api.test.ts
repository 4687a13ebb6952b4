import request from 'supertest';
import { MAX_UPLOAD_BYTES } from '../../shared/uploads/csv-formats';
import { count, DEMO, makeEnv, type TestEnv } from './helpers';

let env: TestEnv;
let admin: string;
let charge: string;
let nurse: string;
beforeAll(async () => {
  env = await makeEnv();
  [admin, charge, nurse] = await Promise.all([env.signIn(DEMO.admin), env.signIn(DEMO.charge), env.signIn(DEMO.nurse)]);
});
afterAll(() => env.close());

const upload = (path: string, token: string | null, content: string | Buffer, filename = 'file.csv', contentType = 'text/csv') => {
  let r = request(env.app).post(path);
  if (token) r = r.set('Authorization', `Bearer ${token}`);
  return r.attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content), { filename, contentType });
};
const post = (path: string, token: string) => request(env.app).post(path).set('Authorization', `Bearer ${token}`);
const TABLES = ['users', 'user_units', 'email_tokens', 'uploads', 'readings', 'flags', 'audit_events'];
const snapshot = () => Object.fromEntries(TABLES.map((t) => [t, count(env.database, t)]));

const ROSTER = [
  'name,email,role,unit',
  'Tamsin Hollow,tamsin.hollow@warmfold.test,nurse,Neonatal Unit North',
  'Bram Okonjo,bram.okonjo@warmfold.test,charge,unit-south',
  'Nia Okafor,nia.okafor@warmfold.test,nurse,unit-north',
].join('\n');

describe('roster CSV', () => {
  it('previews with per-row errors before anything is written', async () => {
    const before = snapshot();
    const bad = ['name,email,role,unit', 'Ok Person,ok.person@warmfold.test,nurse,unit-north', 'X,not-mail,pilot,Nowhere', 'Dup One,ok.person@warmfold.test,nurse,unit-north'].join('\n');
    const res = await upload('/api/admin/roster/preview', admin, bad, 'roster.csv');
    expect(res.status).toBe(201);
    expect(res.body.errorCount).toBe(2);
    expect(res.body.rows[1]).toEqual(expect.objectContaining({ line: 3, action: 'error' }));
    expect(res.body.rows[1].errors.join(' ')).toMatch(/name.*email.*role/);
    expect(res.body.rows[2].errors).toEqual(['email: appears more than once in this file']);
    const after = snapshot();
    expect(after.users).toBe(before.users);
    expect(after.email_tokens).toBe(before.email_tokens);
    // A file with errors cannot be imported: 400 with the field, nothing written.
    const imp = await post(`/api/admin/roster/${res.body.upload.id}/import`, admin);
    expect(imp.status).toBe(400);
    expect(imp.body.error.fields.file).toMatch(/line 3/);
    expect(count(env.database, 'users')).toBe(before.users);
  });

  it('imports and invites the new people, skips existing ones; the same file again creates nothing', async () => {
    const sent = env.mailer.sent.length;
    const preview = await upload('/api/admin/roster/preview', admin, ROSTER, 'roster.csv');
    expect(preview.body).toEqual(expect.objectContaining({ errorCount: 0, toCreate: 2, alreadyImported: false }));
    expect(preview.body.rows[2]).toEqual(expect.objectContaining({ action: 'skip', note: 'Already has an account' }));
    const users = count(env.database, 'users');
    const imp = await post(`/api/admin/roster/${preview.body.upload.id}/import`, admin);
    expect(imp.status).toBe(200);
    expect(imp.body).toEqual({ created: 2, skipped: 1, alreadyImported: false });
    expect(count(env.database, 'users')).toBe(users + 2);
    expect(env.mailer.sent.slice(sent).map((m) => m.to[0]).sort()).toEqual(['bram.okonjo@warmfold.test', 'tamsin.hollow@warmfold.test']);

    const before = snapshot();
    const again = await upload('/api/admin/roster/preview', admin, ROSTER, 'roster-copy.csv');
    expect(again.status).toBe(201);
    expect(again.body.alreadyImported).toBe(true);
    expect(again.body.upload.id).toBe(preview.body.upload.id);
    expect(again.body.toCreate).toBe(0);
    const imp2 = await post(`/api/admin/roster/${again.body.upload.id}/import`, admin);
    expect(imp2.body).toEqual(expect.objectContaining({ created: 0, alreadyImported: true }));
    expect(snapshot()).toEqual(before);
  });

  it('refuses wrong types, missing files, missing columns and files over the size limit', async () => {
    const before = snapshot();
    const wrongType = await upload('/api/admin/roster/preview', admin, '%PDF-1.4', 'roster.pdf', 'application/pdf');
    expect(wrongType.status).toBe(400);
    expect(wrongType.body.error.fields.file).toBeDefined();
    const noFile = await post('/api/admin/roster/preview', admin);
    expect(noFile.status).toBe(400);
    expect(noFile.body.error.fields.file).toBeDefined();
    const columns = await upload('/api/admin/roster/preview', admin, 'name,email\nA B,a@b.test', 'roster.csv');
    expect(columns.status).toBe(400);
    expect(columns.body.error.fields.file).toMatch(/role, unit/);
    const big = await upload('/api/admin/roster/preview', admin, Buffer.alloc(MAX_UPLOAD_BYTES + 10, 'a'), 'big.csv');
    expect(big.status).toBe(413);
    expect(big.body.error.fields.file).toBeDefined();
    expect(snapshot()).toEqual(before);
  });

  it('only admins upload rosters', async () => {
    expect((await upload('/api/admin/roster/preview', charge, ROSTER)).status).toBe(403);
    expect((await upload('/api/admin/roster/preview', null, ROSTER)).status).toBe(401);
    expect((await post('/api/admin/roster/nope/import', admin)).status).toBe(404);
  });
});

const READINGS = [
  'infant,time,probe,remote,site,unit,mode,output,heart_rate',
  'N07,2026-11-16T09:40:00Z,36.6,36.7,axilla,C,skin-servo,40,148',
  'N08,2026-11-16T09:41:00Z,97.9,98.2,rectal,F,skin-servo,,150',
  'inf-glimmerton,2026-11-16T09:42:00Z,,,,C,,,152',
].join('\n');

describe('readings CSV', () => {
  it('previews, then imports every row in one transaction; re-uploading imports nothing twice', async () => {
    const preview = await upload('/api/readings-import/preview?unitId=unit-north', charge, READINGS, 'readings.csv');
    expect(preview.status).toBe(201);
    expect(preview.body).toEqual(expect.objectContaining({ errorCount: 0, toCreate: 3 }));
    const readings = count(env.database, 'readings');
    const imp = await post(`/api/readings-import/${preview.body.upload.id}/import`, charge);
    expect(imp.body).toEqual({ created: 3, skipped: 0, alreadyImported: false });
    expect(count(env.database, 'readings')).toBe(readings + 3);
    const f = env.database.sqlite.prepare("SELECT probe_centi, remote_centi, remote_site, entered_unit FROM readings WHERE taken_at = ?").get(Date.parse('2026-11-16T09:41:00Z')) as Record<string, unknown>;
    expect(f).toEqual({ probe_centi: 3661, remote_centi: 3678, remote_site: 'rectal', entered_unit: 'F' });

    const before = snapshot();
    const again = await upload('/api/readings-import/preview?unitId=unit-north', charge, READINGS, 'readings-again.csv');
    expect(again.body.alreadyImported).toBe(true);
    expect((await post(`/api/readings-import/${again.body.upload.id}/import`, charge)).body.created).toBe(0);
    // The same rows inside another file are recognised too.
    const other = await upload('/api/readings-import/preview?unitId=unit-north', charge, `${READINGS}\n`, 'readings-3.csv');
    expect(other.body.rows.every((r: { action: string; note: string }) => r.action === 'skip' && r.note === 'Already charted')).toBe(true);
    const imp3 = await post(`/api/readings-import/${other.body.upload.id}/import`, charge);
    expect(imp3.body.created).toBe(0);
    expect(count(env.database, 'readings')).toBe(before.readings);
  });

  it('reports every failing row with its line and reason, and imports nothing from such a file', async () => {
    const bad = [
      'infant,time,probe,remote,site,unit,mode,output,heart_rate',
      'N07,2026-11-16T09:50:00Z,36.6,36.7,axilla,C,skin-servo,40,148',
      'N99,2026-11-16T09:51:00Z,36.6,,,C,,,',
      'N07,yesterday,36.6,,,C,,,',
      'N07,2026-11-16T09:52:00Z,55.0,36.7,,K,turbo,140,999',
      'N07,2026-11-16T09:53:00Z,36.6',
    ].join('\n');
    const before = snapshot();
    const preview = await upload('/api/readings-import/preview?unitId=unit-north', charge, bad, 'bad.csv');
    expect(preview.status).toBe(201);
    expect(preview.body.errorCount).toBe(4);
    const byLine = Object.fromEntries(preview.body.rows.map((r: { line: number; errors: string[] }) => [r.line, r.errors.join(' | ')]));
    expect(byLine[2]).toBe('');
    expect(byLine[3]).toMatch(/infant: no admitted infant "N99"/);
    expect(byLine[4]).toMatch(/time: use ISO 8601/);
    expect(byLine[5]).toMatch(/unit: use C or F/);
    expect(byLine[5]).toMatch(/site: say where/);
    expect(byLine[5]).toMatch(/mode:/);
    expect(byLine[5]).toMatch(/output:/);
    expect(byLine[5]).toMatch(/heart_rate:/);
    expect(byLine[6]).toMatch(/row: too few fields/i);
    const imp = await post(`/api/readings-import/${preview.body.upload.id}/import`, charge);
    expect(imp.status).toBe(400);
    expect(imp.body.error.fields.file).toMatch(/4 rows have errors \(first: line 3/);
    const after = snapshot();
    expect(after.readings).toBe(before.readings);
    expect(after.flags).toBe(before.flags);
  });

  it('is for charge nurses of the unit: 400 without a unit, 403 otherwise, 401 signed out', async () => {
    expect((await upload('/api/readings-import/preview', charge, READINGS)).body.error.fields.unitId).toBeDefined();
    expect((await upload('/api/readings-import/preview?unitId=unit-south', charge, READINGS)).status).toBe(403);
    expect((await upload('/api/readings-import/preview?unitId=unit-north', nurse, READINGS)).status).toBe(403);
    expect((await upload('/api/readings-import/preview?unitId=unit-north', admin, READINGS)).status).toBe(403);
    expect((await upload('/api/readings-import/preview?unitId=unit-north', null, READINGS)).status).toBe(401);
    expect((await upload('/api/readings-import/preview?unitId=unit-north', charge, 'a,b', 'x.txt', 'text/plain')).status).toBe(400);
    expect((await post('/api/readings-import/none/import', charge)).status).toBe(404);
  });
});
