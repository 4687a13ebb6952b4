import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { CorrectReadingForm } from '@/components/bedside/correct-reading-form';
import { ThemeProvider } from '@/components/theme/theme-provider';
import type { ReadingVersion } from '@/shared/types/bedside';

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

function setup(unit: 'C' | 'F' = 'C') {
  const onSubmit = jest.fn();
  render(
    <ThemeProvider initial="light">
      <CorrectReadingForm reading={READING} unit={unit} timeZone="Europe/London" clock="24h" now={() => NOW} makeId={() => '5d2c7a43-4a55-4a8e-9f55-0d5b6e1d2c11'} onSubmit={onSubmit} />
    </ThemeProvider>,
  );
  return { onSubmit };
}

const save = () => fireEvent.press(screen.getByRole('button', { name: 'Save correction' }));

describe('CorrectReadingForm', () => {
  it('asks what was wrong, then saves the new values as a new version', async () => {
    const { onSubmit } = setup();
    expect(screen.getByLabelText(/^Probe temperature/).props.value).toBe('36.9');
    save();
    expect(await screen.findByText('Say briefly what was wrong.')).toBeTruthy();
    fireEvent.changeText(screen.getByLabelText('What was wrong'), 'Typed the probe wrong.');
    fireEvent.changeText(screen.getByLabelText(/^Probe temperature/), '36.5');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    const sent = onSubmit.mock.calls[0][0];
    expect(sent).toMatchObject({ id: '5d2c7a43-4a55-4a8e-9f55-0d5b6e1d2c11', reason: 'corrected-value', note: 'Typed the probe wrong.', values: { unit: 'C', probe: 36.5, remote: 36.2, remoteSite: 'axilla', set: 36.5, heartRate: 150 } });
    // The time was not changed, so the reading keeps its own.
    expect(sent.values.takenAt).toBeUndefined();
  });

  it('removes an entry made in error without new values', async () => {
    const { onSubmit } = setup();
    fireEvent.press(screen.getByRole('radio', { name: 'Entered in error' }));
    expect(screen.queryByLabelText(/^Probe temperature/)).toBeNull();
    fireEvent.changeText(screen.getByLabelText('What was wrong'), 'Charted on the wrong infant.');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0]).toEqual({ id: '5d2c7a43-4a55-4a8e-9f55-0d5b6e1d2c11', reason: 'entered-in-error', note: 'Charted on the wrong infant.' });
  });

  it('shows and takes the values in °F', async () => {
    const { onSubmit } = setup('F');
    expect(screen.getByLabelText('Probe temperature (°F)').props.value).toBe('98.4');
    fireEvent.changeText(screen.getByLabelText('What was wrong'), 'Wrong value.');
    fireEvent.changeText(screen.getByLabelText(/^Remote-site temperature/), '97.7');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0].values).toMatchObject({ unit: 'F', remote: 97.7 });
  });
});
