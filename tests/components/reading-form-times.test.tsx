/**
 * The reading form's time, day, one-decimal and error behaviour. Expected instants are worked out
 * by hand: London is UTC+0 in November, New York UTC−5 (from memory).
 */
import { act, fireEvent, screen, waitFor } from '@testing-library/react-native';
import { TextInput } from 'react-native';
import { ReadingForm, type ReadingFormProps } from '@/components/bedside/reading-form';
import { setup } from './setup';

// Mon 16 Nov 2026, 20:48 in London: the evening of the example.
const EVENING = new Date('2026-11-16T20:48:00Z');

function renderForm(overrides: Partial<ReadingFormProps> = {}, now = EVENING) {
  const onSubmit = jest.fn();
  const result = setup(
    <ReadingForm
      unit="C"
      timeZone="Europe/London"
      gapLimitCenti={50}
      defaults={{ controlMode: 'skin-servo', set: '36.5', remoteSite: 'axilla' }}
      now={() => now}
      makeId={() => '0b7b8a43-4a55-4a8e-9f55-0d5b6e1d2c11'}
      onSubmit={onSubmit}
      {...overrides}
    />,
  );
  return { onSubmit, ...result };
}

const type = (label: RegExp, text: string) => fireEvent.changeText(screen.getByLabelText(label), text);
const save = () => fireEvent.press(screen.getByRole('button', { name: 'Save reading' }));
const chooseDay = (name: string) => fireEvent.press(screen.getByRole('radio', { name }));

/** The label of the input focused last: the test renderer's TextInput records `this` on its focus mock. */
function lastFocused(): string | undefined {
  const focus = TextInput.prototype.focus as unknown as jest.Mock;
  const contexts = focus.mock.contexts as { props: { accessibilityLabel?: string } }[];
  return contexts.at(-1)?.props.accessibilityLabel;
}

// The form's checks load lazily (zod stays out of the first page); load them once before the clock-bound tests.
beforeAll(async () => {
  await import('@/components/forms/schemas');
});
beforeEach(() => (TextInput.prototype.focus as unknown as jest.Mock).mockClear?.());

describe('the day of a reading is named, never guessed', () => {
  it('refuses a time later than now today, as the server does, instead of filing it as yesterday', async () => {
    const { onSubmit } = renderForm();
    type(/^Probe temperature/, '36.8');
    type(/^Time taken/, '21:18');
    expect(screen.getByText('Taken: Today, 21:18')).toBeTruthy();
    save();
    expect(await screen.findByText('The time cannot be in the future.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    // No late-entry reason is asked for a time ahead of the clock.
    expect(screen.queryByLabelText(/^Why is this charted late/)).toBeNull();
  });

  it('takes the same time on yesterday, named, with the late-entry reason', async () => {
    const { onSubmit } = renderForm();
    type(/^Probe temperature/, '36.8');
    type(/^Time taken/, '21:18');
    chooseDay('Yesterday');
    expect(screen.getByText('Taken: Yesterday, 21:18')).toBeTruthy();
    save();
    expect(await screen.findByText(/more than 10 minutes ago: say why/)).toBeTruthy();
    type(/^Why is this charted late/, 'Charted after a transfer.');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ takenAt: '2026-11-15T21:18:00.000Z', lateReason: 'Charted after a transfer.' });
  });

  it('offers a date two days back by name and files the time on it', async () => {
    const { onSubmit } = renderForm();
    type(/^Probe temperature/, '36.8');
    chooseDay('Sat 14 Nov');
    type(/^Time taken/, '0915');
    expect(screen.getByText('Taken: Sat 14 Nov, 09:15')).toBeTruthy();
    type(/^Why is this charted late/, 'Found on a paper chart.');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0].takenAt).toBe('2026-11-14T09:15:00.000Z');
  });

  it('asks for the time when another day is chosen without one', async () => {
    const { onSubmit } = renderForm();
    type(/^Probe temperature/, '36.8');
    chooseDay('Yesterday');
    save();
    expect(await screen.findByText('Enter the time it was taken on that day.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it("keeps the server's 2-minute tolerance: 20:50 is taken at 20:48, 20:51 is refused", async () => {
    const { onSubmit } = renderForm();
    type(/^Probe temperature/, '36.8');
    type(/^Time taken/, '20:51');
    save();
    expect(await screen.findByText('The time cannot be in the future.')).toBeTruthy();
    type(/^Time taken/, '20:50');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ takenAt: '2026-11-16T20:50:00.000Z', lateReason: null });
  });

  it("uses the unit's zone, not the device's: 20:00 in New York is 01:00 UTC the next day", async () => {
    // 01:30 UTC on 17 Nov is 20:30 on 16 Nov in New York.
    const { onSubmit } = renderForm({ timeZone: 'America/New_York' }, new Date('2026-11-17T01:30:00Z'));
    type(/^Probe temperature/, '36.8');
    type(/^Time taken/, '20:25');
    expect(screen.getByText('Taken: Today, 20:25')).toBeTruthy();
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0].takenAt).toBe('2026-11-17T01:25:00.000Z');
  });

  it('saves now when no time is entered', async () => {
    const { onSubmit } = renderForm();
    expect(screen.getByText('Taken: now, when you save.')).toBeTruthy();
    type(/^Probe temperature/, '36.8');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0].takenAt).toBe(EVENING.toISOString());
  });
});

describe('temperatures to one decimal place, as thermometers show them', () => {
  // °C = (°F − 32) × 5/9 (NIST SP 811, appendix B.8): 97.71 °F → 36.51 °C and 98.62 °F → 37.01 °C in
  // hundredths, exactly 0.50 °C apart though 0.91 °F apart. Two decimals are refused in the unit typed.
  it('refuses 97.71 °F and 98.62 °F with a clear error, and takes 97.7 and 98.6', async () => {
    const { onSubmit } = renderForm({ unit: 'F', defaults: { controlMode: 'skin-servo', set: '97.7', remoteSite: 'axilla' } });
    type(/^Probe temperature/, '97.71');
    type(/^Remote-site temperature/, '98.62');
    save();
    expect(await screen.findByText('Probe temperature: enter one decimal place, e.g. 98.2.')).toBeTruthy();
    expect(screen.getByText('Remote-site temperature: enter one decimal place, e.g. 98.2.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    type(/^Probe temperature/, '97.7');
    type(/^Remote-site temperature/, '98.6');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ unit: 'F', probe: 97.7, remote: 98.6 });
  });

  it('refuses two decimals in °C too, with a decimal comma as well', async () => {
    const { onSubmit } = renderForm();
    type(/^Probe temperature/, '36,85');
    save();
    expect(await screen.findByText('Probe temperature: enter one decimal place, e.g. 36.8.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });
});

describe('errors you can see', () => {
  it('focuses the first field at fault on Save, and its error is announced', async () => {
    const { onSubmit } = renderForm();
    type(/^Probe temperature/, '36.8');
    type(/^Heart rate/, '400');
    type(/^Time taken/, '19:30');
    save();
    const error = await screen.findByText('Heart rate must be a whole number from 30 to 300.');
    expect(error.props.role).toBe('alert');
    await waitFor(() => expect(lastFocused()).toBe('Heart rate (/min)'));
    // The heart rate put right, the next fault is the missing late-entry reason further down.
    type(/^Heart rate/, '150');
    save();
    await screen.findByText(/more than 10 minutes ago: say why/);
    await waitFor(() => expect(lastFocused()).toBe('Why is this charted late?'));
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('focuses the field the server refused (its clock found the time in the future)', async () => {
    const { rerender, onSubmit } = renderForm();
    const props = {
      unit: 'C' as const,
      timeZone: 'Europe/London',
      gapLimitCenti: 50,
      defaults: { controlMode: 'skin-servo' as const, set: '36.5', remoteSite: 'axilla' as const },
      now: () => EVENING,
      onSubmit,
    };
    (TextInput.prototype.focus as unknown as jest.Mock).mockClear();
    rerender(<ReadingForm {...props} serverFields={{ takenAt: 'The time cannot be in the future.' }} serverMessage="The time is in the future." />);
    expect(screen.getByText('The time cannot be in the future.')).toBeTruthy();
    await waitFor(() => expect(lastFocused()).toBe('Time taken (leave empty for now)'));
  });

  it('focuses the time when it is in the future', async () => {
    renderForm();
    type(/^Probe temperature/, '36.8');
    type(/^Time taken/, '23:00');
    await act(async () => save());
    await screen.findByText('The time cannot be in the future.');
    await waitFor(() => expect(lastFocused()).toBe('Time taken (leave empty for now)'));
  });
});
