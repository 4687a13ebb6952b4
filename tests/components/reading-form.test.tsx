import { fireEvent, screen, waitFor } from '@testing-library/react-native';
import { ReadingForm, type ReadingFormProps } from '@/components/bedside/reading-form';
import { loadSchemas } from '@/components/forms/lazy-resolver';
import { setup as render } from './setup';

// The form's checks load on first use; loading them once up front keeps the first test's
// waits about the form, not about compiling the schemas on a busy machine.
beforeAll(() => loadSchemas());

const NOW = new Date('2026-11-16T10:00:00Z');

function setup(overrides: Partial<ReadingFormProps> = {}) {
  const onSubmit = jest.fn();
  const { user } = render(
    <ReadingForm
      unit="C"
      timeZone="Europe/London"
      gapLimitCenti={50}
      defaults={{ controlMode: 'skin-servo', set: '36.5', remoteSite: 'axilla' }}
      now={() => NOW}
      makeId={() => '0b7b8a43-4a55-4a8e-9f55-0d5b6e1d2c11'}
      onSubmit={onSubmit}
      {...overrides}
    />,
  );
  return { onSubmit, user };
}

/** Spy on the focus() of the input labelled so (the host input's component instance). */
function focusOf(label: RegExp) {
  const instance = screen.getByLabelText(label).parent?.instance as { focus: () => void } | null | undefined;
  if (!instance) throw new Error(`no input instance for ${label}`);
  // An own mock per input (a spy on the shared prototype would count every input's focus).
  const focus = jest.fn();
  instance.focus = focus;
  return focus;
}

const type = (label: RegExp, text: string) => fireEvent.changeText(screen.getByLabelText(label), text);
const save = () => fireEvent.press(screen.getByRole('button', { name: 'Save reading' }));

describe('ReadingForm', () => {
  it('asks for at least one value, and names a value that is not a number', async () => {
    const { onSubmit } = setup();
    save();
    expect(await screen.findByText('Enter at least one temperature or the heart rate.')).toBeTruthy();
    type(/^Probe temperature/, 'abc');
    save();
    expect(await screen.findByText('Probe temperature must be a number, like 36.8.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('refuses a value outside the hard limits with the reason', async () => {
    const { onSubmit } = setup();
    type(/^Probe temperature/, '48');
    save();
    expect(await screen.findByText(/Probe temperature must be between 20.0 and 45.0 °C/)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('shows the gap as she types, and saves probe and remote site with the carried defaults', async () => {
    const { onSubmit } = setup();
    type(/^Probe temperature/, '36.9');
    type(/^Remote-site temperature/, '36.2');
    expect(screen.getByText('Gap 0.7 °C: over the 0.5 °C limit. A gap flag will be raised.')).toBeTruthy();
    expect(screen.getByText('Remote site: Cold stress (mild hypothermia)')).toBeTruthy();
    type(/^Remote-site temperature/, '36.4');
    expect(screen.getByText('Gap 0.5 °C: within the 0.5 °C limit.')).toBeTruthy();
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({
      id: '0b7b8a43-4a55-4a8e-9f55-0d5b6e1d2c11',
      unit: 'C',
      probe: 36.9,
      remote: 36.4,
      remoteSite: 'axilla',
      set: 36.5,
      controlMode: 'skin-servo',
      takenAt: NOW.toISOString(),
      confirmedImplausible: false,
    });
  });

  it('takes °F and shows the gap in °F', async () => {
    const { onSubmit } = setup({ unit: 'F', defaults: { controlMode: 'skin-servo', set: '97.7', remoteSite: 'axilla' } });
    expect(screen.getByLabelText('Probe temperature (°F)')).toBeTruthy();
    type(/^Probe temperature/, '98.6');
    type(/^Remote-site temperature/, '97.3');
    expect(screen.getByText('Gap 1.3 °F: over the 0.9 °F limit. A gap flag will be raised.')).toBeTruthy();
    type(/^Remote-site temperature/, '97.7');
    expect(screen.getByText('Gap 0.9 °F: within the 0.9 °F limit.')).toBeTruthy();
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ unit: 'F', probe: 98.6, remote: 97.7 });
  });

  it('asks to confirm an unusual value before saving it', async () => {
    const { onSubmit } = setup();
    type(/^Probe temperature/, '33.5');
    save();
    expect(await screen.findByRole('button', { name: 'Confirm and save' })).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    fireEvent.press(screen.getByRole('button', { name: 'Confirm and save' }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ probe: 33.5, confirmedImplausible: true });
  });

  it('asks why an earlier time is charted late', async () => {
    const { onSubmit } = setup();
    type(/^Probe temperature/, '36.8');
    type(/^Time taken/, '09:30');
    save();
    expect(await screen.findByText(/more than 10 minutes ago: say why/)).toBeTruthy();
    type(/^Why is this charted late/, 'Emergency at the next cot.');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalled());
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ takenAt: '2026-11-16T09:30:00.000Z', lateReason: 'Emergency at the next cot.' });
  });

  it('Enter (the keypad Next) moves probe, remote site, air, heater output, heart rate in turn, and saves from the last', async () => {
    const { onSubmit, user } = setup();
    const focus = {
      remote: focusOf(/^Remote-site temperature/),
      air: focusOf(/^Air temperature/),
      heater: focusOf(/^Heater output/),
      heartRate: focusOf(/^Heart rate/),
    };
    await user.type(screen.getByLabelText(/^Probe temperature/), '36.8', { submitEditing: true });
    expect(focus.remote).toHaveBeenCalledTimes(1);
    expect(focus.air).not.toHaveBeenCalled();
    await user.type(screen.getByLabelText(/^Remote-site temperature/), '36.6', { submitEditing: true });
    expect(focus.air).toHaveBeenCalledTimes(1);
    await user.type(screen.getByLabelText(/^Air temperature/), '31.8', { submitEditing: true });
    expect(focus.heater).toHaveBeenCalledTimes(1);
    await user.type(screen.getByLabelText(/^Heater output/), '40', { submitEditing: true });
    expect(focus.heartRate).toHaveBeenCalledTimes(1);
    expect(onSubmit).not.toHaveBeenCalled();
    await user.type(screen.getByLabelText(/^Heart rate/), '142', { submitEditing: true });
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    // The settings came forward: mode, set temperature and remote site as last charted.
    expect(onSubmit.mock.calls[0][0]).toMatchObject({
      probe: 36.8,
      remote: 36.6,
      remoteSite: 'axilla',
      air: 31.8,
      heaterOutputPct: 40,
      heartRate: 142,
      set: 36.5,
      controlMode: 'skin-servo',
    });
  });

  it('in air servo the air set temperature is the third field, carried forward and in the Enter order; air temperature is left with the other observations', async () => {
    const { onSubmit, user } = setup({ defaults: { controlMode: 'air-servo', set: '33.2', remoteSite: 'axilla' } });
    const airSet = screen.getByLabelText(/^Air set temperature/);
    expect(airSet.props.value).toBe('33.2');
    const focus = { airSet: focusOf(/^Air set temperature/), heater: focusOf(/^Heater output/) };
    await user.type(screen.getByLabelText(/^Probe temperature/), '36.7', { submitEditing: true });
    await user.type(screen.getByLabelText(/^Remote-site temperature/), '36.5', { submitEditing: true });
    expect(focus.airSet).toHaveBeenCalledTimes(1);
    await user.clear(airSet);
    await user.type(airSet, '33.5', { submitEditing: true });
    expect(focus.heater).toHaveBeenCalledTimes(1);
    await user.type(screen.getByLabelText(/^Heater output/), '25', { submitEditing: true });
    await user.type(screen.getByLabelText(/^Heart rate/), '150', { submitEditing: true });
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ controlMode: 'air-servo', set: 33.5, air: null, probe: 36.7, remote: 36.5, heaterOutputPct: 25, heartRate: 150 });
  });

  it('shows the settings carried forward from the last reading, and never fills in a measurement', () => {
    setup({ defaults: { controlMode: 'skin-servo', set: '36.5', remoteSite: 'rectal' } });
    expect(screen.getByText('From the last reading: Skin servo, set 36.5 °C, remote site rectal. Change any that changed.')).toBeTruthy();
    expect(screen.getByRole('radio', { name: 'Skin servo' }).props.accessibilityState?.checked ?? screen.getByRole('radio', { name: 'Skin servo' }).props['aria-checked']).toBe(
      true,
    );
    expect(screen.getByRole('radio', { name: 'Rectal' }).props.accessibilityState?.checked ?? screen.getByRole('radio', { name: 'Rectal' }).props['aria-checked']).toBe(true);
    expect(screen.getByLabelText(/^Set temperature/).props.value).toBe('36.5');
    for (const label of [/^Probe temperature/, /^Remote-site temperature/, /^Air temperature/, /^Heater output/, /^Heart rate/]) {
      expect(screen.getByLabelText(label).props.value).toBe('');
    }
  });

  it('says so when nothing comes forward (no earlier reading)', () => {
    setup({ defaults: { controlMode: null, set: '', remoteSite: null } });
    expect(screen.getByText('No earlier reading: choose the settings.')).toBeTruthy();
  });
});
