import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { ReadingForm, type ReadingFormProps } from '@/components/bedside/reading-form';
import { ThemeProvider } from '@/components/theme/theme-provider';

const NOW = new Date('2026-11-16T10:00:00Z');

function setup(overrides: Partial<ReadingFormProps> = {}) {
  const onSubmit = jest.fn();
  render(
    <ThemeProvider initial="light">
      <ReadingForm
        unit="C"
        timeZone="Europe/London"
        gapLimitCenti={50}
        defaults={{ controlMode: 'skin-servo', set: '36.5', remoteSite: 'axilla' }}
        now={() => NOW}
        makeId={() => '0b7b8a43-4a55-4a8e-9f55-0d5b6e1d2c11'}
        onSubmit={onSubmit}
        {...overrides}
      />
    </ThemeProvider>,
  );
  return { onSubmit };
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
});
