/**
 * The reading form's placement settings, current weight and incubator humidity.
 *
 * Clinical checks and their sources:
 * - a probe on the abdomen of an infant lying prone reads the mattress: move it to the back or
 *   flank (Iowa Neonatology Handbook, "Servocontrol": flank if prone; common practice);
 * - a probe on the axilla: the remote-site check is taken elsewhere (common practice);
 * - weight 300–8000 g (common practice); humidity 0–100 % (by definition).
 */
import { fireEvent, screen, waitFor, within } from '@testing-library/react-native';
import { ReadingForm, type ReadingFormProps } from '@/components/bedside/reading-form';
import { loadSchemas } from '@/components/forms/lazy-resolver';
import { setup as render } from './setup';

beforeAll(() => loadSchemas());

const NOW = new Date('2026-11-16T10:00:00Z');

function setup(placement: NonNullable<ReadingFormProps['defaults']['placement']> | null, overrides: Partial<ReadingFormProps> = {}) {
  const onSubmit = jest.fn();
  const { user } = render(
    <ReadingForm
      unit="C"
      timeZone="Europe/London"
      gapLimitCenti={50}
      defaults={{ controlMode: 'skin-servo', set: '36.5', remoteSite: 'axilla', placement }}
      now={() => NOW}
      makeId={() => '0b7b8a43-4a55-4a8e-9f55-0d5b6e1d2c11'}
      onSubmit={onSubmit}
      {...overrides}
    />,
  );
  return { onSubmit, user };
}

const type = (label: RegExp, text: string) => fireEvent.changeText(screen.getByLabelText(label), text);
const save = () => fireEvent.press(screen.getByRole('button', { name: 'Save reading' }));
const choose = (group: string, option: string) => fireEvent.press(within(screen.getByLabelText(group)).getByRole('radio', { name: option }));
const chosen = (group: string) =>
  within(screen.getByLabelText(group))
    .getAllByRole('radio')
    .filter((r) => r.props.accessibilityState?.checked === true || r.props['aria-checked'] === true)
    .map((r) => r.props.accessibilityLabel as string);

describe('ReadingForm: the probe placement', () => {
  it('shows the current placement chosen already, as settings', () => {
    setup({ probeSite: 'back-or-flank', probeCovered: true, position: 'prone' });
    expect(chosen('Probe site')).toEqual(['Back or flank']);
    expect(chosen('Heat-reflecting cover over the probe')).toEqual(['Covered']);
    expect(chosen("Infant's position")).toEqual(['On the front (prone)']);
    // Measurements are never filled in.
    expect(screen.getByLabelText(/^Current weight/).props.value).toBe('');
    expect(screen.getByLabelText(/^Incubator humidity/).props.value).toBe('');
  });

  it('prompts before saving when the probe is on the abdomen of a prone infant, and clears when it moves to the back', async () => {
    const { onSubmit } = setup({ probeSite: 'abdomen', probeCovered: true, position: 'supine' });
    expect(screen.queryByText(/reads the mattress/)).toBeNull();
    choose("Infant's position", 'On the front (prone)');
    expect(await screen.findByText(/reads the mattress, not the infant/)).toBeTruthy();
    choose('Probe site', 'Back or flank');
    await waitFor(() => expect(screen.queryByText(/reads the mattress/)).toBeNull());
    type(/^Probe temperature/, '36.4');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ probe: 36.4, probeSite: 'back-or-flank', probeCovered: true, position: 'prone', weightGrams: null, humidityPct: null });
  });

  it('saves with the prompt showing (it is a prompt, not a refusal), sending the placement as charted', async () => {
    const { onSubmit } = setup({ probeSite: 'abdomen', probeCovered: false, position: 'prone' });
    expect(screen.getByText(/reads the mattress, not the infant/)).toBeTruthy();
    type(/^Probe temperature/, '36.2');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ probeSite: 'abdomen', probeCovered: false, position: 'prone' });
  });

  it('says where to take the remote-site check when the probe is on the axilla, and refuses the axilla for it', async () => {
    const { onSubmit } = setup({ probeSite: 'axilla', probeCovered: false, position: 'supine' });
    expect(screen.getByText(/take the remote-site temperature elsewhere/)).toBeTruthy();
    type(/^Probe temperature/, '36.6');
    type(/^Remote-site temperature/, '36.9');
    save();
    expect(await screen.findByText(/The probe is on the axilla: take the remote-site temperature at another site/)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    choose('Remote site', 'Rectal');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ remote: 36.9, remoteSite: 'rectal', probeSite: 'axilla' });
  });

  it('sends nothing charted when no placement was ever charted and none is chosen', async () => {
    const { onSubmit } = setup(null);
    expect(chosen('Probe site')).toEqual([]);
    type(/^Probe temperature/, '36.6');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ probeSite: null, probeCovered: null, position: null });
  });
});

describe('ReadingForm: current weight and incubator humidity', () => {
  it('sends them as whole numbers', async () => {
    const { onSubmit } = setup(null);
    type(/^Probe temperature/, '36.6');
    type(/^Current weight/, '1085');
    type(/^Incubator humidity/, '70');
    save();
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0][0]).toMatchObject({ weightGrams: 1085, humidityPct: 70 });
  });

  it.each([
    ['Current weight', '299', /Weight in whole grams, 300 to 8000/],
    ['Current weight', '1200.5', /Weight in whole grams, 300 to 8000/],
    ['Incubator humidity', '101', /Humidity in whole percent, 0 to 100/],
    ['Incubator humidity', 'high', /Humidity in whole percent, 0 to 100/],
  ])('refuses %s "%s" with the range', async (label, text, message) => {
    const { onSubmit } = setup(null);
    type(/^Probe temperature/, '36.6');
    type(new RegExp(`^${label}`), text);
    save();
    expect(await screen.findByText(message)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });
});
