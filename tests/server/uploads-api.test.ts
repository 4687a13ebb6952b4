import Papa from 'papaparse';
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
    const bad = ['name,email,role,unit', 'Ok Person,ok.person@warmfold.test,nurse,unit-north', 'X,not-mail,pilot,Nowhere', 'Dup One,ok.person@warmfold.test,nurse,unit-north'].join(
      '\n',
    );
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
    expect(
      env.mailer.sent
        .slice(sent)
        .map((m) => m.to[0])
        .sort(),
    ).toEqual(['bram.okonjo@warmfold.test', 'tamsin.hollow@warmfold.test']);

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
    // The limit is stated: 1 MB = 1,048,576 bytes (IEC binary megabyte as the file systems count it).
    expect(big.body.error.fields.file).toMatch(/1 MB \(1,048,576 bytes\)/);
    expect(big.body.error.message).toMatch(/limit of 1 MB/);
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
    const f = env.database.sqlite
      .prepare('SELECT probe_centi, remote_centi, remote_site, entered_unit FROM readings WHERE taken_at = ?')
      .get(Date.parse('2026-11-16T09:41:00Z')) as Record<string, unknown>;
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
    expect(byLine[4]).toMatch(/time: use a date and time such as 2026-11-16T08:00/);
    expect(byLine[5]).toMatch(/unit: use C or F/);
    expect(byLine[5]).toMatch(/site: say where/);
    expect(byLine[5]).toMatch(/mode:/);
    expect(byLine[5]).toMatch(/output:/);
    expect(byLine[5]).toMatch(/heart_rate:/);
    expect(byLine[6]).toMatch(/row: 3 cells, but the header has 9/);
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

describe('readings import: what it refuses and whom it credits', () => {
  const HEAD = 'infant,time,probe,remote,site,unit,mode,output,heart_rate,set,taken_by';
  const preview = (text: string | Buffer, name = 'r.csv') => upload('/api/readings-import/preview?unitId=unit-north', charge, text, name);
  const importWith = (id: string, confirmedLines: number[] = []) => post(`/api/readings-import/${id}/import`, charge).send({ confirmedLines });
  const errorsOf = (body: { rows: { line: number; errors: string[] }[] }) => Object.fromEntries(body.rows.map((r) => [r.line, r.errors.join(' | ')]));

  it('strict calendar dates: 31 November and 30 February are refused with the line and the field (Gregorian calendar)', async () => {
    const res = await preview([HEAD, 'N07,2026-11-31T22:00,36.6,,,C,,,,,', 'N07,2026-02-30T08:00:00Z,36.6,,,C,,,,,', 'N07,2026-13-01T08:00,36.6,,,C,,,,,'].join('\n'));
    expect(res.status).toBe(201);
    const byLine = errorsOf(res.body);
    expect(byLine[2]).toBe('time: 2026-11-31 is not a date (November 2026 has 30 days)');
    expect(byLine[3]).toBe('time: 2026-02-30 is not a date (February 2026 has 28 days)');
    expect(byLine[4]).toMatch(/^time: 2026-13-01 is not a date/);
  });

  it("a time without an offset is the unit's wall clock; times the clocks skip or repeat are refused (UK clock changes, gov.uk: last Sunday of March and October at 01:00 UTC)", async () => {
    const res = await preview([HEAD, 'N07,2026-11-16T09:30,36.6,,,C,,,,,', 'N07,2026-03-29T01:30,36.6,,,C,,,,,', 'N07,2026-10-25T01:30,36.6,,,C,,,,,'].join('\n'), 'zones.csv');
    const byLine = errorsOf(res.body);
    expect(byLine[2]).toBe('');
    expect(byLine[3]).toMatch(/time: 2026-03-29T01:30 does not exist in Europe\/London/);
    expect(byLine[4]).toMatch(/time: 2026-10-25T01:30 happened twice in Europe\/London/);
  });

  it('lists unusual rows and imports only when each is confirmed by its line; air set points are judged as air (common practice)', async () => {
    const text = [
      HEAD,
      'N07,2026-11-16T09:00:00Z,36.6,31.2,axilla,C,skin-servo,,148,,',
      'N07,2026-11-16T09:05:00Z,36.6,,,C,skin-servo,,245,,',
      'N08,2026-11-16T09:06:00Z,36.6,,,C,air-servo,,150,32.0,',
      'N08,2026-11-16T09:07:00Z,36.6,,,C,skin-servo,,150,32.0,',
    ].join('\n');
    const res = await preview(text, 'unusual.csv');
    expect(res.body.errorCount).toBe(0);
    expect(res.body.toConfirm).toEqual([2, 3, 5]);
    const byLine = Object.fromEntries(res.body.rows.map((r: { line: number; unusual?: string[] }) => [r.line, (r.unusual ?? []).join(' | ')]));
    expect(byLine[2]).toMatch(/Remote-site temperature 31.2 °C is outside the usual 34.0–39.5 °C/);
    expect(byLine[3]).toMatch(/Heart rate 245\/min is outside the usual 80–220\/min/);
    expect(byLine[4]).toBe('');
    expect(byLine[5]).toMatch(/Set temperature 32.0 °C is outside the usual 34.0–38.0 °C for skin servo/);
    const before = snapshot();
    const none = await importWith(res.body.upload.id);
    expect(none.status).toBe(400);
    expect(none.body.error.fields.confirmedLines).toMatch(/line 2: .*line 3: .*line 5: /);
    const some = await importWith(res.body.upload.id, [2, 5]);
    expect(some.status).toBe(400);
    expect(some.body.error.fields.confirmedLines).toMatch(/^line 3: Heart rate 245/);
    expect(snapshot()).toEqual(before);
    const all = await importWith(res.body.upload.id, [2, 3, 5]);
    expect(all.body).toEqual({ created: 4, skipped: 0, alreadyImported: false });
    const bad = await post(`/api/readings-import/${res.body.upload.id}/import`, charge).send({ confirmedLines: 'all' });
    expect(bad.status).toBe(400);
  });

  it('credits the nurse named in taken_by; a row naming nobody credits no nurse, and the review queue names the importer, not a nurse', async () => {
    const text = [
      HEAD,
      // Probe 1.0 °C above the remote site: a gap flag (the unit's 0.5 °C limit).
      'N05,2026-11-16T09:10:00Z,37.4,36.4,axilla,C,skin-servo,,150,,',
      'N06,2026-11-16T09:11:00Z,37.4,36.4,axilla,C,skin-servo,,150,,NIA.OKAFOR@warmfold.test',
      'N06,2026-11-16T09:12:00Z,36.6,,,C,skin-servo,,150,,nobody@warmfold.test',
    ].join('\n');
    const res = await preview(text, 'credit.csv');
    expect(errorsOf(res.body)[4]).toBe('taken_by: no nurse of this unit has the e-mail nobody@warmfold.test');
    const ok = await preview(text.split('\n').slice(0, 3).join('\n'), 'credit-ok.csv');
    expect((await importWith(ok.body.upload.id)).status).toBe(200);
    const rows = env.database.sqlite
      .prepare('SELECT r.id, r.recorded_by, r.taken_by, r.upload_id FROM readings r WHERE r.upload_id = ? ORDER BY r.taken_at')
      .all(ok.body.upload.id) as { id: string; recorded_by: string; taken_by: string | null; upload_id: string }[];
    expect(rows.map((r) => [r.recorded_by, r.taken_by, r.upload_id])).toEqual([
      ['u-charge', null, ok.body.upload.id],
      ['u-charge', 'u-nurse', ok.body.upload.id],
    ]);
    const educator = await env.signIn(DEMO.educator);
    const queue = await request(env.app).get('/api/review/queue?unitId=unit-north&kind=gap&limit=200').set('Authorization', `Bearer ${educator}`);
    const flagOf = (readingId: string) => env.database.sqlite.prepare('SELECT id FROM flags WHERE raised_by_reading_id = ?').get(readingId) as { id: string };
    const item = (readingId: string) => queue.body.items.find((i: { flagId: string }) => i.flagId === flagOf(readingId).id);
    expect(item(rows[0]!.id)).toEqual(expect.objectContaining({ nurse: null, importedBy: { id: 'u-charge', name: expect.any(String) } }));
    expect(item(rows[1]!.id)).toEqual(expect.objectContaining({ nurse: { id: 'u-nurse', name: 'Nia Okafor' }, importedBy: null }));
  });

  it('reads UTF-8 with a byte-order mark, semicolons and decimal commas', async () => {
    const text = '\uFEFF' + ['infant;time;probe;remote;site;unit;mode;output;heart_rate', 'N04;2026-11-16T09:20:00Z;36,6;36,9;axilla;C;skin-servo;40;148'].join('\r\n');
    const res = await preview(Buffer.from(text, 'utf8'), 'semicolons.csv');
    expect(res.body).toEqual(expect.objectContaining({ errorCount: 0, toCreate: 1 }));
    expect((await importWith(res.body.upload.id)).status).toBe(200);
    expect(env.database.sqlite.prepare('SELECT probe_centi, remote_centi FROM readings WHERE upload_id = ?').get(res.body.upload.id)).toEqual({
      probe_centi: 3660,
      remote_centi: 3690,
    });
  });

  it('refuses a binary file and a file in another encoding as not text, writing nothing', async () => {
    const before = snapshot();
    // The PNG signature (ISO/IEC 15948 §5.2): 89 50 4E 47 0D 0A 1A 0A.
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
    const res = await preview(png, 'photo.csv');
    expect(res.status).toBe(400);
    expect(res.body.error.fields.file).toMatch(/not text: it looks like a PNG image/);
    // "Inês" in ISO-8859-1: ê is the single byte EA, not valid UTF-8 (RFC 3629).
    const latin1 = Buffer.from(`${HEAD}\nN07,2026-11-16T09:00:00Z,36.6,,,C,,,,,In\xeas`, 'latin1');
    const res2 = await preview(latin1, 'latin1.csv');
    expect(res2.status).toBe(400);
    expect(res2.body.error.fields.file).toMatch(/not UTF-8 text/);
    expect(snapshot()).toEqual(before);
  });

  it('a row with an unclosed quote is an error on its own line and does not swallow the next', async () => {
    const text = [HEAD, '"N07,2026-11-16T09:30:00Z,36.6,,,C,,,,,', 'N07,2026-11-16T09:31:00Z,36.7,,,C,,,,,'].join('\n');
    const res = await preview(text, 'quote.csv');
    const byLine = errorsOf(res.body);
    expect(byLine[2]).toMatch(/row: a quoted cell is not closed on this line/);
    expect(byLine[3]).toBe('');
    expect(res.body.rows).toHaveLength(2);
  });

  it('the refused rows download as CSV with line, field and reason', async () => {
    const res = await preview(
      [HEAD, 'N07,2026-11-31T22:00,36.6,,,C,,,,,', 'N99,2026-11-16T09:00:00Z,36.6,,,C,,,,,', 'N07,2026-11-16T09:00:00Z,36.6,,,C,,,,,'].join('\n'),
      'errs.csv',
    );
    const csv = await request(env.app).get(`/api/readings-import/${res.body.upload.id}/errors.csv`).set('Authorization', `Bearer ${charge}`).buffer(true);
    expect(csv.status).toBe(200);
    expect(csv.headers['content-disposition']).toMatch(/errs-errors\.csv/);
    expect(csv.text.startsWith('\uFEFF')).toBe(true);
    const rows = Papa.parse<Record<string, string>>(csv.text.slice(1), { header: true, skipEmptyLines: true }).data;
    expect(rows.map((r) => [r.line, r.field])).toEqual([
      ['2', 'time'],
      ['3', 'infant'],
    ]);
    expect(rows[0]!.reason).toBe('2026-11-31 is not a date (November 2026 has 30 days)');
    expect((await request(env.app).get(`/api/readings-import/${res.body.upload.id}/errors.csv`).set('Authorization', `Bearer ${nurse}`)).status).toBe(403);
  });
});
