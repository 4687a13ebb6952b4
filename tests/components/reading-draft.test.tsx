import { act, screen, waitFor } from '@testing-library/react-native';
import { Text } from 'react-native';
import { storage } from '@/components/api/storage';
import { useAuth } from '@/components/auth/auth-provider';
import { SessionSheet } from '@/components/auth/session-sheet';
import { TOKEN_KEY, USER_KEY } from '@/components/auth/session-keys';
import { pendingReadings } from '@/components/bedside/pending-readings';
import { RecordReadingScreen } from '@/components/bedside/record-reading-screen';
import { hasTypedValues, readingDrafts } from '@/components/bedside/reading-draft';
import { setup } from './setup';

const mockRouter = { replace: jest.fn(), push: jest.fn(), back: jest.fn() };
// A getter: the mock is made when the screens are imported, before this file's constants exist.
jest.mock('expo-router', () => ({
  useRouter: () => mockRouter,
  get router() {
    return mockRouter;
  },
}));

const INFANT = 'inf-glimmerton';
const ZONE = 'Europe/London';
const NIA = { id: 'u-nia', name: 'Nia Okafor', email: 'nia.okafor@warmfold.test', role: 'nurse', unitIds: ['unit-north'], theme: 'light', tempUnit: 'C', clock: '24h' };
const MARTA = {
  id: 'u-marta',
  name: 'Marta Lindqvist',
  email: 'marta.lindqvist@warmfold.test',
  role: 'charge',
  unitIds: ['unit-north'],
  theme: 'light',
  tempUnit: 'C',
  clock: '24h',
};
const PASSWORD = 'warm-hands-at-night';

const DETAIL = {
  infant: { id: INFANT, unitId: 'unit-north', timeZone: ZONE, bedId: 'bed-7', bedLabel: 'N07', displayName: 'Baby Glimmerton A' },
  timeZone: ZONE,
  defaults: { controlMode: 'skin-servo', setCenti: 3650, remoteSite: 'axilla' },
};

type Json = Record<string, unknown>;

/**
 * A stand-in for the API over fetch: sessions by token (revocable, as sign-out elsewhere does),
 * the infant's form data, and readings stored once by id as the real route does.
 */
function fakeApi() {
  const sessions = new Map<string, typeof NIA>();
  const stored = new Map<string, Json>();
  const posts: { token: string | null; body: Json }[] = [];
  let refuseWith: { status: number; message: string; fields?: Record<string, string> } | null = null;
  let issued = 0;
  const answer = (status: number, json: unknown) => ({ ok: status < 400, status, headers: { get: () => null }, json: async () => json }) as unknown as Response;
  const fetchMock = jest.fn(async (url: string, init: { method?: string; headers?: Record<string, string>; body?: string } = {}) => {
    const path = url.replace(/^.*\/api/, '');
    const method = init.method ?? 'GET';
    const token = init.headers?.Authorization?.replace('Bearer ', '') ?? null;
    const who = token ? sessions.get(token) : undefined;
    if (method === 'POST' && path === '/auth/sign-in') {
      const { email, password } = JSON.parse(init.body ?? '{}') as { email: string; password: string };
      const user = [NIA, MARTA].find((u) => u.email === email);
      if (!user || password !== PASSWORD) return answer(401, { error: { code: 'unauthorized', message: 'Wrong e-mail or password.' } });
      const next = `token-${++issued}`;
      sessions.set(next, user);
      return answer(200, { token: next, user });
    }
    const reading = method === 'POST' && path === `/infants/${INFANT}/readings` ? (JSON.parse(init.body ?? '{}') as Json) : null;
    if (reading) posts.push({ token, body: reading });
    if (!who) return answer(401, { error: { code: 'unauthorized', message: 'Your session has ended. Please sign in again.' } });
    if (path === '/auth/me') return answer(200, { user: who });
    if (path === `/infants/${INFANT}`) return answer(200, DETAIL);
    if (path.startsWith(`/infants/${INFANT}/flowsheet`)) return answer(200, { policy: { gapLimitCenti: 50 } });
    if (reading) {
      const body = reading;
      if (refuseWith) return answer(refuseWith.status, { error: { code: 'invalid', message: refuseWith.message, fields: refuseWith.fields ?? {} } });
      const created = !stored.has(String(body.id));
      if (created) stored.set(String(body.id), { ...body, by: who.id });
      return answer(created ? 201 : 200, {
        reading: { id: body.id },
        created,
        openFlags: [],
        nextCheck: { status: 'ok', dueAt: null, minutesLate: 0 },
        raisedFlagIds: [],
        closedFlagIds: [],
      });
    }
    return answer(404, { error: { code: 'not-found', message: `No ${method} ${path} here.` } });
  });
  return {
    fetchMock,
    stored,
    posts,
    /** A session as the app stores it after signing in. */
    signIn(user: typeof NIA) {
      const token = `token-${++issued}`;
      sessions.set(token, user);
      storage.set(TOKEN_KEY, token);
      storage.set(USER_KEY, JSON.stringify(user));
      return token;
    },
    /** The server ends a session (signed out on another device, expired, revoked). */
    endSession(token: string) {
      sessions.delete(token);
    },
    refuse(next: typeof refuseWith) {
      refuseWith = next;
    },
  };
}

/** What the signed-in layout does: the screen for a user, and sign-in over it when the session ends. */
function SignedIn() {
  const { user } = useAuth();
  if (!user) return <Text>Signed out</Text>;
  return (
    <>
      <RecordReadingScreen infantId={INFANT} />
      <SessionSheet />
    </>
  );
}

function open() {
  return setup(<SignedIn />, { auth: true });
}

const probe = () => screen.getByLabelText(/^Probe temperature/);
const remote = () => screen.getByLabelText(/^Remote-site temperature/);

/** "HH:MM" in the unit's zone, written independently of the app's formatting. */
function clockAt(ms: number): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone: ZONE, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' }).format(ms);
}

let api: ReturnType<typeof fakeApi>;
beforeEach(() => {
  api = fakeApi();
  globalThis.fetch = api.fetchMock as unknown as typeof fetch;
  readingDrafts.clearAll();
  pendingReadings.clearAll();
  readingDrafts.reset();
  pendingReadings.reset();
  mockRouter.replace.mockClear();
  storage.remove(TOKEN_KEY);
  storage.remove(USER_KEY);
});

describe('the record form keeps a draft', () => {
  it('brings typed values back after a reload, says from when, and saves them once with the draft’s id', async () => {
    api.signIn(NIA);
    const first = open();
    await first.findByLabelText(/^Probe temperature/);
    const typedAt = Date.now();
    await first.user.type(probe(), '36.8');
    await first.user.type(remote(), '36.4');
    first.unmount();

    // A reload: the page starts again, reading the device's storage afresh.
    readingDrafts.reset();
    const again = open();
    await again.findByLabelText(/^Probe temperature/);
    expect(probe().props.value).toBe('36.8');
    expect(remote().props.value).toBe('36.4');
    const notice = await again.findByText(/^Draft kept from /);
    const shown = /Draft kept from (\d\d:\d\d)$/.exec(String(notice.props.children))?.[1];
    expect([clockAt(typedAt), clockAt(Date.now())]).toContain(shown);

    await again.user.press(again.getByRole('button', { name: 'Save reading' }));
    await waitFor(() => expect(mockRouter.replace).toHaveBeenCalledWith(`/infants/${INFANT}`));
    expect(api.posts).toHaveLength(1);
    expect(api.posts[0]!.body).toMatchObject({ probe: 36.8, remote: 36.4 });
    // The id kept with the draft is the one sent: a save after a restore is the same reading.
    const draftId = api.posts[0]!.body.id;
    expect(api.stored.has(String(draftId))).toBe(true);
    expect(readingDrafts.get(NIA.id, INFANT)).toBeNull();
  });

  it('keeps no draft for a form opened and left untouched', async () => {
    api.signIn(NIA);
    const view = open();
    await view.findByLabelText(/^Probe temperature/);
    view.unmount();
    readingDrafts.reset();
    expect(readingDrafts.all()).toEqual([]);
    open();
    await screen.findByLabelText(/^Probe temperature/);
    expect(probe().props.value).toBe('');
    expect(screen.queryByText(/Draft kept/)).toBeNull();
  });

  it('Discard draft empties the form and forgets the values on the device', async () => {
    api.signIn(NIA);
    const first = open();
    await first.findByLabelText(/^Probe temperature/);
    await first.user.type(probe(), '37.9');
    expect(await first.findByText('Kept on this device as a draft until you save.')).toBeTruthy();
    first.unmount();

    const again = open();
    await again.findByText(/^Draft kept from /);
    expect(probe().props.value).toBe('37.9');
    await again.user.press(again.getByRole('button', { name: 'Discard draft' }));
    await waitFor(() => expect(probe().props.value).toBe(''));
    expect(again.queryByText(/Draft kept/)).toBeNull();
    readingDrafts.reset();
    expect(readingDrafts.get(NIA.id, INFANT)).toBeNull();
  });

  it("never shows one nurse's measurements to another user of the same phone", async () => {
    const niaToken = api.signIn(NIA);
    const first = open();
    await first.findByLabelText(/^Probe temperature/);
    await first.user.type(probe(), '36.1');
    first.unmount();
    api.endSession(niaToken);

    // Marta signs in on the same device and opens the same infant's form.
    api.signIn(MARTA);
    readingDrafts.reset();
    const marta = open();
    await marta.findByLabelText(/^Probe temperature/);
    expect(probe().props.value).toBe('');
    expect(marta.queryByText(/Draft kept/)).toBeNull();
    await marta.user.type(probe(), '36.9');
    marta.unmount();

    // Nia again: her own value, not Marta's.
    api.signIn(NIA);
    readingDrafts.reset();
    const nia = open();
    await nia.findByText(/^Draft kept from /);
    expect(probe().props.value).toBe('36.1');
    expect(readingDrafts.get(MARTA.id, INFANT)?.values.probe).toBe('36.9');
  });
});

describe('what is worth a draft', () => {
  it('a measurement, a note or a sign is; settings carried from the last reading alone are not', () => {
    const settings = { controlMode: 'air-servo', set: '33.2', remoteSite: 'axilla', probeSite: 'abdomen', probeCovered: 'yes', position: 'prone' } as const;
    expect(hasTypedValues({ ...settings, probe: '', remote: ' ', heatSigns: [], note: '' })).toBe(false);
    expect(hasTypedValues({ ...settings, heartRate: '148' })).toBe(true);
    expect(hasTypedValues({ ...settings, note: 'Moved to the back' })).toBe(true);
    expect(hasTypedValues({ ...settings, heatSigns: ['sweating'] })).toBe(true);
  });
});

describe('a session that ends while the nurse saves', () => {
  it('asks her to sign in over the form and then stores the same reading, once', async () => {
    const token = api.signIn(NIA);
    const view = open();
    await view.findByLabelText(/^Probe temperature/);
    await view.user.type(probe(), '36.9');
    await view.user.type(remote(), '36.3');
    api.endSession(token);
    await view.user.press(view.getByRole('button', { name: 'Save reading' }));

    // Sign-in appears over the form, which keeps what she typed.
    await view.findByText('Your session ended');
    expect(probe().props.value).toBe('36.9');
    expect(api.stored.size).toBe(0);
    expect(view.getByLabelText('E-mail').props.value).toBe(NIA.email);
    await view.user.type(view.getByLabelText('Password'), PASSWORD);
    await view.user.press(view.getByRole('button', { name: 'Sign in' }));

    await waitFor(() => expect(mockRouter.replace).toHaveBeenCalledWith(`/infants/${INFANT}`));
    expect(view.queryByText('Your session ended')).toBeNull();
    const ids = api.posts.map((p) => p.body.id);
    expect(ids).toHaveLength(2);
    expect(ids[1]).toBe(ids[0]);
    expect(api.stored.size).toBe(1);
    expect([...api.stored.values()][0]).toMatchObject({ probe: 36.9, remote: 36.3, by: NIA.id });
    expect(readingDrafts.get(NIA.id, INFANT)).toBeNull();
    expect(pendingReadings.all()).toEqual([]);
  });

  it("does not send the first nurse's reading when someone else signs in; it stays as her draft", async () => {
    const token = api.signIn(NIA);
    const view = open();
    await view.findByLabelText(/^Probe temperature/);
    await view.user.type(probe(), '36.7');
    api.endSession(token);
    await view.user.press(view.getByRole('button', { name: 'Save reading' }));
    await view.findByText('Your session ended');

    const email = view.getByLabelText('E-mail');
    await view.user.clear(email);
    await view.user.type(email, MARTA.email);
    await view.user.type(view.getByLabelText('Password'), PASSWORD);
    await view.user.press(view.getByRole('button', { name: 'Sign in' }));

    // Marta lands on her own home screen, with an empty form if she is shown one.
    await waitFor(() => expect(view.queryByText('Your session ended')).toBeNull());
    await waitFor(() => expect(mockRouter.replace).toHaveBeenCalledWith('/board'));
    await waitFor(() => expect(probe().props.value).toBe(''));
    await act(async () => {
      await new Promise((resolve) => setTimeout(resolve, 50));
    });
    expect(api.posts).toHaveLength(1); // only the attempt that met the ended session
    expect(api.stored.size).toBe(0);
    readingDrafts.reset();
    expect(readingDrafts.get(NIA.id, INFANT)?.values.probe).toBe('36.7');
  });
});

describe('a reading the server refuses', () => {
  it('stays pending with the reason, and the draft stays too', async () => {
    api.signIn(NIA);
    api.refuse({ status: 409, message: 'This infant has been discharged.' });
    const view = open();
    await view.findByLabelText(/^Probe temperature/);
    await view.user.type(probe(), '36.6');
    await view.user.press(view.getByRole('button', { name: 'Save reading' }));
    await view.findByText('This infant has been discharged.');
    expect(pendingReadings.forInfant(INFANT).map((p) => [p.refusal, p.label, p.values?.probe])).toEqual([['This infant has been discharged.', 'N07 Baby Glimmerton A', '36.6']]);
    expect(readingDrafts.get(NIA.id, INFANT)?.values.probe).toBe('36.6');
    expect(mockRouter.replace).not.toHaveBeenCalled();
  });
});
