import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { describeAccessChange } from '@/components/admin-users/admin-home-screen';
import { ConfirmDialog, type PendingChange } from '@/components/admin-users/confirm-dialog';
import { ThemeProvider } from '@/components/theme/theme-provider';

/**
 * Changes that take access away ask first, naming the person and the change (common practice for
 * destructive actions; WAI-ARIA Authoring Practices, "Alert and Message Dialogs" pattern).
 */

const NAMES: Record<string, string> = { 'unit-north': 'Neonatal Unit North', 'unit-south': 'Special Care South' };
const unitName = (id: string) => NAMES[id] ?? id;

describe('describeAccessChange', () => {
  it('names the role change and each unit removed or added', () => {
    const lines = describeAccessChange('Kofi Mensah', { role: 'nurse', unitIds: ['unit-north', 'unit-south'] }, { role: 'charge', unitIds: ['unit-north'] }, unitName);
    expect(lines).toEqual([
      'Role: Bedside nurse → Charge nurse.',
      'Removed from Special Care South: Kofi Mensah no longer sees its infants.',
      'Kofi Mensah is signed out and signs in again with the new access.',
    ]);
  });

  it('says nothing when nothing changes (unit order does not matter)', () => {
    expect(
      describeAccessChange('Kofi Mensah', { role: 'nurse', unitIds: ['unit-north', 'unit-south'] }, { role: 'nurse', unitIds: ['unit-south', 'unit-north'] }, unitName),
    ).toEqual([]);
  });
});

function setup(run: PendingChange['run']) {
  const onClose = jest.fn();
  const change: PendingChange = {
    title: 'Deactivate Kofi Mensah?',
    lines: ['Kofi Mensah (kofi.mensah@warmfold.test) is signed out at once and cannot sign in until an administrator reactivates the account.'],
    confirmLabel: 'Deactivate Kofi Mensah',
    danger: true,
    run,
  };
  render(
    <ThemeProvider initial="light">
      <ConfirmDialog change={change} onClose={onClose} />
    </ThemeProvider>,
  );
  return { onClose };
}

describe('ConfirmDialog', () => {
  it('shows the person and the change; Cancel makes no change', () => {
    const run = jest.fn(async () => undefined);
    const { onClose } = setup(run);
    expect(screen.getByRole('heading', { name: 'Deactivate Kofi Mensah?' })).toBeTruthy();
    expect(screen.getByText(/kofi\.mensah@warmfold\.test\) is signed out at once/)).toBeTruthy();
    fireEvent.press(screen.getByRole('button', { name: 'Cancel' }));
    expect(onClose).toHaveBeenCalledTimes(1);
    expect(run).not.toHaveBeenCalled();
  });

  it('confirming makes the change once, then closes', async () => {
    const run = jest.fn(async () => undefined);
    const { onClose } = setup(run);
    fireEvent.press(screen.getByRole('button', { name: 'Deactivate Kofi Mensah' }));
    await waitFor(() => expect(onClose).toHaveBeenCalledTimes(1));
    expect(run).toHaveBeenCalledTimes(1);
  });

  it('a refused change stays open with the reason', async () => {
    const run = jest.fn(async () => {
      throw new Error('Kofi Mensah also works in Special Care South, which you do not administer.');
    });
    const { onClose } = setup(run);
    fireEvent.press(screen.getByRole('button', { name: 'Deactivate Kofi Mensah' }));
    expect(await screen.findByRole('alert')).toBeTruthy();
    expect(onClose).not.toHaveBeenCalled();
  });
});
