/** Shared set-up of the flag-*.test.ts files: a ward on a fresh app; admitted infants discharged after each test. */
import { Ward } from './clinical-views';
import { makeEnv, type TestEnv } from './helpers';

export function wardSuite() {
  const s = { env: undefined as unknown as TestEnv, ward: undefined as unknown as Ward, admitted: [] as string[] };
  beforeAll(async () => {
    s.env = await makeEnv();
    s.ward = new Ward(s.env);
  });
  afterAll(() => s.env.close());
  afterEach(async () => {
    for (const id of s.admitted.splice(0)) await s.ward.discharge(id).catch(() => undefined);
    s.ward.advance(60);
  });
  return s;
}
