import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { CorrectReadingForm } from '@/components/bedside/correct-reading-form';
import { readingDrafts } from '@/components/bedside/reading-draft';
import { storage } from '@/components/api/storage';
import type { ReadingVersion } from '@/shared/types/bedside';
import { setup } from './setup';

const NOW = new Date('2026-11-16T10:00:00Z');
const READING: ReadingVersion = {
  id: 'r-1',
  infantId: 'inf-1',
  takenAt: '2026-11-16T09:55:00.000Z',
  recordedAt: '2026-11-16T09:55:30.000Z',
  recordedBy: { id: 'u-nia', name: 'Nia Okafor' },
  probeCenti: 3690,
  remoteCenti: 3620,
  remoteSite: 'axilla',
  airCenti: null,
  setCenti: 3650,
  controlMode: 'skin-servo',
  heaterOutputPct: null,
  heartRate: 150,
  heatSigns: [],
  note: null,
  enteredUnit: 'C',
  lateReason: null,
  sessionId: null,
  replacesId: null,
  correctionReason: null,
  correctionNote: null,
  enteredInError: false,
};
const NIA = 'u-nia';
const MARTA = 'u-marta';
const LABEL = 'N07 Baby Glimmerton A';

let ids = 0;
function renderForm(userId = NIA) {
  const onSubmit = jest.fn();
  const utils = setup(
    <CorrectReadingForm
      reading={READING}
      unit="C"
      timeZone="Europe/London"
      clock="24h"
      now={() => NOW}
      makeId={() => `corr-${++ids}`}
      onSubmit={onSubmit}
      draft={{ userId, infantId: 'inf-1', label: LABEL }}
    />,
  );
  return { onSubmit, ...utils };
}

const probe = () => screen.getByLabelText(/^Probe temperature/).props.value as string;

beforeAll(async () => {
  await import('@/components/forms/schemas');
});

beforeEach(() => {
  readingDrafts.clearAll();
  storage.remove('warmfold.reading-drafts.v1');
  readingDrafts.reset();
  ids = 0;
});

describe('the correction form keeps a draft on the device', () => {
  it('keeps what she changed and brings it back after a reload, for her only', async () => {
    const first = renderForm();
    fireEvent.changeText(screen.getByLabelText('What was wrong'), 'Typed the probe wrong.');
    fireEvent.changeText(screen.getByLabelText(/^Probe temperature/), '36.5');
    await waitFor(() => expect(readingDrafts.get(NIA, 'inf-1', 'r-1')?.values.probe).toBe('36.5'));
    first.unmount();
    // A reload: only what the device stored is left.
    readingDrafts.reset();
    renderForm();
    expect(probe()).toBe('36.5');
    expect(screen.getByLabelText('What was wrong').props.value).toBe('Typed the probe wrong.');
    expect(screen.getByText(/^Draft kept from /)).toBeTruthy();
    // Kept apart from the infant's record draft, and counted for the sign-out warning.
    expect(readingDrafts.get(NIA, 'inf-1')).toBeNull();
    expect(readingDrafts.all().map((d) => d.label)).toEqual([LABEL]);
    screen.unmount();
    renderForm(MARTA);
    expect(probe()).toBe('36.9');
    expect(screen.queryByText(/^Draft kept from /)).toBeNull();
  });

  it('keeps no draft while nothing differs from the reading as charted', async () => {
    renderForm();
    fireEvent.changeText(screen.getByLabelText(/^Probe temperature/), '36.5');
    await waitFor(() => expect(readingDrafts.get(NIA, 'inf-1', 'r-1')).not.toBeNull());
    fireEvent.changeText(screen.getByLabelText(/^Probe temperature/), '36.9');
    await waitFor(() => expect(readingDrafts.get(NIA, 'inf-1', 'r-1')).toBeNull());
  });

  it('says when the draft was kept, and discarding it brings the charted values back', async () => {
    readingDrafts.keep(
      { userId: NIA, infantId: 'inf-1', correcting: 'r-1', readingId: 'corr-kept', label: LABEL, values: { reason: 'corrected-value', why: 'Wrong infant.', probe: '36.4' } },
      new Date('2026-11-16T09:58:00Z'),
    );
    readingDrafts.reset();
    renderForm();
    // London is on GMT in November: 09:58 UTC is 09:58 on the ward's clock.
    expect(screen.getByText('Draft kept from 09:58')).toBeTruthy();
    expect(probe()).toBe('36.4');
    fireEvent.press(screen.getByRole('button', { name: 'Discard draft' }));
    await waitFor(() => expect(probe()).toBe('36.9'));
    expect(screen.queryByText(/^Draft kept from /)).toBeNull();
    expect(readingDrafts.get(NIA, 'inf-1', 'r-1')).toBeNull();
  });

  it('saves a restored draft under the id it was kept with, so a repeat is stored once', async () => {
    readingDrafts.keep({
      userId: NIA,
      infantId: 'inf-1',
      correcting: 'r-1',
      readingId: 'corr-kept',
      label: LABEL,
      values: { reason: 'corrected-value', why: 'Typed the probe wrong.', probe: '36.4' },
    });
    readingDrafts.reset();
    const { onSubmit } = renderForm();
    fireEvent.press(screen.getByRole('button', { name: 'Save correction' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ id: 'corr-kept', note: 'Typed the probe wrong.', values: { probe: 36.4 } });
  });
});
