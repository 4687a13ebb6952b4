import { screen, waitFor } from '@testing-library/react-native';
import { Text } from 'react-native';
import { storage } from '@/components/api/storage';
import { useAuth } from '@/components/auth/auth-provider';
import { TOKEN_KEY, USER_KEY } from '@/components/auth/session-keys';
import { pendingReadings } from '@/components/bedside/pending-readings';
import { readingDrafts } from '@/components/bedside/reading-draft';
import { SignOutDialog, useSignOut } from '@/components/shell/sign-out';
import { Button } from '@/components/ui/button';
import { setup } from './setup';

const NIA = { id: 'u-nia', name: 'Nia Okafor', email: 'nia.okafor@warmfold.test', role: 'nurse', unitIds: ['unit-north'], theme: 'light', tempUnit: 'C', clock: '24h' };
const body = (id: string) => ({
  id,
  unit: 'C' as const,
  takenAt: '2026-11-16T03:10:00.000Z',
  probe: 36.8,
  remote: 36.5,
  remoteSite: 'axilla' as const,
  confirmedImplausible: false,
});

function Shell() {
  const { user } = useAuth();
  const signOut = useSignOut();
  return (
    <>
      <Text>{user ? `signed in as ${user.name}` : 'signed out'}</Text>
      <Button label="Sign out" onPress={signOut} />
      <SignOutDialog />
    </>
  );
}

let signOuts: string[];
beforeEach(() => {
  readingDrafts.clearAll();
  pendingReadings.clearAll();
  storage.set(TOKEN_KEY, 'nia-token');
  storage.set(USER_KEY, JSON.stringify(NIA));
  signOuts = [];
  globalThis.fetch = jest.fn(async (url: string, init: { method?: string; headers?: Record<string, string> } = {}) => {
    if (url.endsWith('/auth/sign-out')) {
      signOuts.push(init.headers?.Authorization ?? '');
      return { ok: true, status: 204, headers: { get: () => null }, json: async () => null } as unknown as Response;
    }
    return { ok: true, status: 200, headers: { get: () => null }, json: async () => ({ user: NIA }) } as unknown as Response;
  }) as unknown as typeof fetch;
});

function unsavedWorkOnThePhone() {
  readingDrafts.keep({ userId: NIA.id, infantId: 'inf-a', readingId: 'r-draft', label: 'N07 Baby Glimmerton A', values: { probe: '36.9', remote: '' } });
  pendingReadings.add({ infantId: 'inf-b', body: body('r-offline'), savedAt: '2026-11-16T03:11:00.000Z', label: 'N01 Baby Ashdown' });
  pendingReadings.add({ infantId: 'inf-b', body: body('r-refused'), savedAt: '2026-11-16T03:12:00.000Z', label: 'N01 Baby Ashdown' });
  pendingReadings.markRefused('r-refused', 'This infant has been discharged.');
}

describe('signing out with unsaved work on the device', () => {
  it('says how many readings and for which infants, and keeps them if she stays', async () => {
    unsavedWorkOnThePhone();
    const view = setup(<Shell />, { auth: true });
    await view.findByText('signed in as Nia Okafor');
    await view.user.press(view.getByRole('button', { name: 'Sign out' }));

    await view.findByText('3 readings are not saved');
    expect(view.getByText('• N07 Baby Glimmerton A: 1 unsaved draft')).toBeTruthy();
    expect(view.getByText('• N01 Baby Ashdown: 1 reading not yet sent, 1 reading the server refused')).toBeTruthy();

    await view.user.press(view.getByRole('button', { name: 'Stay signed in' }));
    await waitFor(() => expect(view.queryByText('3 readings are not saved')).toBeNull());
    expect(view.getByText('signed in as Nia Okafor')).toBeTruthy();
    expect(signOuts).toEqual([]);
    readingDrafts.reset();
    pendingReadings.reset();
    expect(readingDrafts.all()).toHaveLength(1);
    expect(pendingReadings.all()).toHaveLength(2);
  });

  it('on confirming, signs out and deletes the drafts, the pending readings and the cached patient data', async () => {
    unsavedWorkOnThePhone();
    const view = setup(<Shell />, { auth: true });
    await view.findByText('signed in as Nia Okafor');
    view.queryClient.setQueryData(['infants', 'inf-a'], { infant: { displayName: 'Baby Glimmerton A' } });
    (globalThis as { __warmfoldEarly?: unknown }).__warmfoldEarly = { token: 'nia-token', openedAt: Date.now(), reads: {}, answers: {} };

    await view.user.press(view.getByRole('button', { name: 'Sign out' }));
    await view.user.press(await view.findByRole('button', { name: 'Sign out and delete them' }));

    await view.findByText('signed out');
    expect(signOuts).toEqual(['Bearer nia-token']);
    readingDrafts.reset();
    pendingReadings.reset();
    expect(readingDrafts.all()).toEqual([]);
    expect(pendingReadings.all()).toEqual([]);
    expect(storage.get('warmfold.reading-drafts.v1')).toBeNull();
    expect(storage.get('warmfold.pending-readings.v1')).toBeNull();
    expect(storage.get(TOKEN_KEY)).toBeNull();
    expect(storage.get(USER_KEY)).toBeNull();
    expect(view.queryClient.getQueryCache().getAll()).toEqual([]);
    expect((globalThis as { __warmfoldEarly?: unknown }).__warmfoldEarly).toBeUndefined();
  });

  it('signs out at once when nothing is unsaved', async () => {
    const view = setup(<Shell />, { auth: true });
    await view.findByText('signed in as Nia Okafor');
    await view.user.press(view.getByRole('button', { name: 'Sign out' }));
    await view.findByText('signed out');
    expect(screen.queryByText(/not saved/)).toBeNull();
    expect(signOuts).toEqual(['Bearer nia-token']);
  });
});
