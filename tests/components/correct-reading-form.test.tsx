import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { TextInput } from 'react-native';
import { CorrectReadingForm } from '@/components/bedside/correct-reading-form';
import type { ReadingVersion } from '@/shared/types/bedside';
import { setup } from './setup';

const NOW = new Date('2026-11-16T10:00:00Z');
const READING: ReadingVersion = {
  id: 'r-1',
  infantId: 'inf-1',
  takenAt: '2026-11-16T09:55:00.000Z',
  recordedAt: '2026-11-16T09:55:30.000Z',
  recordedBy: { id: 'u-1', name: 'Nia Okafor' },
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

function renderForm(unit: 'C' | 'F' = 'C', reading: ReadingVersion = READING) {
  const onSubmit = jest.fn();
  setup(
    <CorrectReadingForm
      reading={reading}
      unit={unit}
      timeZone="Europe/London"
      clock="24h"
      now={() => NOW}
      makeId={() => '5d2c7a43-4a55-4a8e-9f55-0d5b6e1d2c11'}
      onSubmit={onSubmit}
    />,
  );
  return { onSubmit };
}

// The form's checks load lazily; load them once so the first test is not racing the import.
beforeAll(async () => {
  await import('@/components/forms/schemas');
});

const save = () => fireEvent.press(screen.getByRole('button', { name: 'Save correction' }));

describe('CorrectReadingForm', () => {
  it('asks what was wrong, then saves the new values as a new version', async () => {
    const { onSubmit } = renderForm();
    expect(screen.getByLabelText(/^Probe temperature/).props.value).toBe('36.9');
    save();
    expect(await screen.findByText('Say briefly what was wrong.')).toBeTruthy();
    fireEvent.changeText(screen.getByLabelText('What was wrong'), 'Typed the probe wrong.');
    fireEvent.changeText(screen.getByLabelText(/^Probe temperature/), '36.5');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    const sent = onSubmit.mock.calls[0][0];
    expect(sent).toMatchObject({
      id: '5d2c7a43-4a55-4a8e-9f55-0d5b6e1d2c11',
      reason: 'corrected-value',
      note: 'Typed the probe wrong.',
      values: { unit: 'C', probe: 36.5, remote: 36.2, remoteSite: 'axilla', set: 36.5, heartRate: 150 },
    });
    // The time was not changed, so the reading keeps its own.
    expect(sent.values.takenAt).toBeUndefined();
  });

  it('removes an entry made in error without new values', async () => {
    const { onSubmit } = renderForm();
    fireEvent.press(screen.getByRole('radio', { name: 'Entered in error' }));
    expect(screen.queryByLabelText(/^Probe temperature/)).toBeNull();
    fireEvent.changeText(screen.getByLabelText('What was wrong'), 'Charted on the wrong infant.');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0]).toEqual({ id: '5d2c7a43-4a55-4a8e-9f55-0d5b6e1d2c11', reason: 'entered-in-error', note: 'Charted on the wrong infant.' });
  });

  it('shows and takes the values in °F', async () => {
    const { onSubmit } = renderForm('F');
    expect(screen.getByLabelText('Probe temperature (°F)').props.value).toBe('98.4');
    fireEvent.changeText(screen.getByLabelText('What was wrong'), 'Wrong value.');
    fireEvent.changeText(screen.getByLabelText(/^Remote-site temperature/), '97.7');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0].values).toMatchObject({ unit: 'F', remote: 97.7 });
  });

  // A reading from last night, corrected this morning (London, UTC+0 in November).
  const LAST_NIGHT: ReadingVersion = { ...READING, id: 'r-2', takenAt: '2026-11-15T22:10:00.000Z', recordedAt: '2026-11-15T22:11:00.000Z' };
  const type = (label: RegExp | string, text: string) => fireEvent.changeText(screen.getByLabelText(label), text);

  it("keeps the reading's day: a changed time stays on yesterday, not today", async () => {
    const { onSubmit } = renderForm('C', LAST_NIGHT);
    expect(screen.getByText('Correcting the reading of Yesterday, 22:10')).toBeTruthy();
    expect(screen.getByRole('radio', { name: 'Yesterday', checked: true })).toBeTruthy();
    expect(screen.getByText('Taken: Yesterday, 22:10')).toBeTruthy();
    type('What was wrong', 'Charted the wrong minute.');
    type(/^Time taken/, '22:40');
    expect(screen.getByText('Taken: Yesterday, 22:40')).toBeTruthy();
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0].values.takenAt).toBe('2026-11-15T22:40:00.000Z');
  });

  it('keeps an older reading on its own date (Sat 14 Nov), offered by name', async () => {
    const older: ReadingVersion = { ...READING, id: 'r-3', takenAt: '2026-11-14T09:15:00.000Z', recordedAt: '2026-11-14T09:16:00.000Z' };
    const { onSubmit } = renderForm('C', older);
    expect(screen.getByRole('radio', { name: 'Sat 14 Nov', checked: true })).toBeTruthy();
    type('What was wrong', 'Charted the wrong minute.');
    type(/^Time taken/, '09:45');
    expect(screen.getByText('Taken: Sat 14 Nov, 09:45')).toBeTruthy();
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0].values.takenAt).toBe('2026-11-14T09:45:00.000Z');
  });

  it('leaves the time alone when only a value changes', async () => {
    const { onSubmit } = renderForm('C', LAST_NIGHT);
    type('What was wrong', 'Typed the probe wrong.');
    type(/^Probe temperature/, '36.6');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0].values).toMatchObject({ probe: 36.6 });
    expect(onSubmit.mock.calls[0][0].values.takenAt).toBeUndefined();
  });

  it('moves the reading to another day only when the nurse chooses it, and refuses a future time', async () => {
    const { onSubmit } = renderForm('C', LAST_NIGHT);
    type('What was wrong', 'Charted on the wrong day.');
    fireEvent.press(screen.getByRole('radio', { name: 'Today' }));
    expect(screen.getByText('Taken: Today, 22:10')).toBeTruthy();
    save();
    expect(await screen.findByText('The time cannot be in the future.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    type(/^Time taken/, '09:40');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0].values.takenAt).toBe('2026-11-16T09:40:00.000Z');
  });

  it('refuses a second decimal (97.71 °F) with a clear error', async () => {
    const { onSubmit } = renderForm('F');
    type('What was wrong', 'Wrong value.');
    type(/^Probe temperature/, '97.71');
    save();
    expect(await screen.findByText('Probe temperature: enter one decimal place, e.g. 98.2.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('focuses the first field at fault on Save', async () => {
    const focus = TextInput.prototype.focus as unknown as jest.Mock;
    focus.mockClear();
    renderForm();
    type(/^Heart rate/, '20');
    save();
    await screen.findByText('Say briefly what was wrong.');
    const last = () => (focus.mock.contexts.at(-1) as { props: { accessibilityLabel?: string } } | undefined)?.props.accessibilityLabel;
    await waitFor(() => expect(last()).toBe('What was wrong'));
    type('What was wrong', 'Heart rate typed wrong.');
    save();
    await screen.findByText('Heart rate must be a whole number from 30 to 300.');
    await waitFor(() => expect(last()).toBe('Heart rate (/min)'));
  });
});
