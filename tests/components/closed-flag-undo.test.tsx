import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import type { ReactNode } from 'react';
import { storage } from '@/components/api/storage';
import { useAuth } from '@/components/auth/auth-provider';
import { TOKEN_KEY, USER_KEY } from '@/components/auth/session-keys';
import { ClosedFlags } from '@/components/bedside/flag-card';
import type { Flowsheet, FlowsheetFlag } from '@/shared/types/bedside';
import { setup } from './setup';

jest.mock('expo-router', () => ({ useRouter: () => ({ replace: jest.fn(), push: jest.fn(), back: jest.fn() }) }));

const NIA = { id: 'u-nia', name: 'Nia Okafor', email: 'nia.okafor@warmfold.test', role: 'nurse', unitIds: ['unit-north'], theme: 'light', tempUnit: 'C', clock: '24h' };

const CLOSED: FlowsheetFlag = {
  id: 'flag-gap',
  key: 'gap:r-1',
  kind: 'gap',
  status: 'closed',
  raisedAt: '2026-11-16T09:00:00.000Z',
  raisedByReadingId: 'r-1',
  closedAt: '2026-11-16T09:30:00.000Z',
  closedByReadingId: 'r-2',
  recheckDueAt: null,
  escalated: false,
  detail: {},
  actions: [{ id: 'act-1', flagId: 'flag-gap', kind: 'checked-probe-contact', note: null, at: '2026-11-16T09:05:00.000Z', recordedBy: { id: 'u-nia', name: 'Nia Okafor' } }],
  how: 'recheck',
};

// Only what the closed-flags list reads of the flowsheet.
const sheet = (flags: FlowsheetFlag[]) => ({ infant: { id: 'inf-1', timeZone: 'Europe/London' }, flags }) as unknown as Flowsheet;

// The list shows once the session is read from storage, as in the app.
function Signed({ children }: { children: ReactNode }) {
  return useAuth().user ? children : null;
}

let posts: string[];
beforeEach(() => {
  storage.set(TOKEN_KEY, 'nia-token');
  storage.set(USER_KEY, JSON.stringify(NIA));
  posts = [];
  globalThis.fetch = jest.fn(async (url: string, init: { method?: string } = {}) => {
    if (init.method === 'POST') posts.push(url.replace(/^.*\/api/, ''));
    const json = init.method === 'POST' ? { undo: { id: 'u-1', actionId: 'act-1', flagId: 'flag-gap' }, reopenedFlagIds: ['flag-gap-2'] } : { user: NIA };
    return { ok: true, status: 200, headers: { get: () => null }, json: async () => json } as unknown as Response;
  }) as unknown as typeof fetch;
});

describe('Undo on a closed flag', () => {
  it('asks first, because the flag opens again, and only then sends the undo (common practice: a mistaken entry is taken back, never left standing)', async () => {
    setup(
      <Signed>
        <ClosedFlags sheet={sheet([CLOSED])} canChart />
      </Signed>,
      { auth: true },
    );
    fireEvent.press(await screen.findByRole('button', { name: 'Undo' }));
    expect(screen.getByText('Undo this action? The flag opens again.')).toBeTruthy();
    expect(posts).toEqual([]);
    fireEvent.press(screen.getByRole('button', { name: 'Keep it' }));
    expect(screen.queryByText('Undo this action? The flag opens again.')).toBeNull();
    fireEvent.press(screen.getByRole('button', { name: 'Undo' }));
    fireEvent.press(screen.getByRole('button', { name: 'Undo and reopen' }));
    await waitFor(() => expect(posts).toEqual(['/flags/flag-gap/actions/act-1/undo']));
  });

  it('is not offered to a reader who cannot chart, nor on a withdrawn flag', async () => {
    setup(
      <Signed>
        <ClosedFlags sheet={sheet([CLOSED])} canChart={false} />
      </Signed>,
      { auth: true },
    );
    expect(await screen.findByText(/closed/)).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Undo' })).toBeNull();
    screen.unmount();
    setup(
      <Signed>
        <ClosedFlags
          sheet={sheet([{ ...CLOSED, status: 'withdrawn', how: 'withdrawn', withdrawn: { reason: 'reading-corrected', readingId: 'r-1', at: CLOSED.closedAt! } }])}
          canChart
        />
      </Signed>,
      { auth: true },
    );
    expect(await screen.findByText(/withdrawn/)).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Undo' })).toBeNull();
  });
});
