/**
 * The export buttons on the reports, review and infant screens: each asks the API for its file
 * and saves it. The fetch stand-in answers as the server does (Content-Disposition names the
 * file); a CSV is saved with the UTF-8 byte-order mark (Unicode §23.8) even though a browser's
 * text() drops it.
 */
import { fireEvent, render, screen, waitFor } from '@testing-library/react-native';
import { Share } from 'react-native';
import { ExportButtons, exportPaths } from '@/components/reports/export-buttons';
import { ThemeProvider } from '@/components/theme/theme-provider';

const requested: string[] = [];
beforeEach(() => {
  requested.length = 0;
  global.fetch = jest.fn(async (url: string) => {
    requested.push(url);
    const fhir = url.includes('fhir');
    const name = fhir ? 'fhir-inf-1-2026-11-01-2026-11-16.json' : url.includes('flags') ? 'flags-2026-11-01-2026-11-16.csv' : 'readings-2026-11-01-2026-11-16.csv';
    const body = fhir ? '{"resourceType":"Bundle","type":"collection"}' : 'reading_id,infant\r\nr1,Baby Inês\r\n';
    return {
      ok: true,
      status: 200,
      headers: { get: (h: string) => (h.toLowerCase() === 'content-disposition' ? `attachment; filename="${name}"` : null) },
      text: async () => body,
      json: async () => JSON.parse(body),
    } as unknown as Response;
  }) as unknown as typeof fetch;
});

const renderButtons = (scope: Parameters<typeof ExportButtons>[0]['scope']) =>
  render(
    <ThemeProvider initial="light">
      <ExportButtons scope={scope} label="Export this infant" />
    </ThemeProvider>,
  );

describe('export buttons', () => {
  it('shows readings CSV, flags CSV and FHIR, and each downloads its file', async () => {
    const share = jest.spyOn(Share, 'share').mockResolvedValue({ action: 'sharedAction' } as never);
    renderButtons({ unitId: 'unit-north', infantId: 'inf-1', from: '2026-11-01', to: '2026-11-16' });
    for (const name of [/Readings CSV/, /Flags CSV/, /FHIR R4/]) expect(screen.getByRole('button', { name })).toBeTruthy();

    fireEvent.press(screen.getByRole('button', { name: /Readings CSV/ }));
    await waitFor(() => expect(screen.getByText('Saved readings-2026-11-01-2026-11-16.csv.')).toBeTruthy());
    expect(requested[0]).toBe('/api/exports/readings.csv?unitId=unit-north&from=2026-11-01&to=2026-11-16&infantId=inf-1');
    expect(share).toHaveBeenLastCalledWith({ title: 'readings-2026-11-01-2026-11-16.csv', message: '\uFEFFreading_id,infant\r\nr1,Baby Inês\r\n' });

    fireEvent.press(screen.getByRole('button', { name: /Flags CSV/ }));
    await waitFor(() => expect(screen.getByText('Saved flags-2026-11-01-2026-11-16.csv.')).toBeTruthy());
    expect(requested[1]).toBe('/api/exports/flags.csv?status=all&unitId=unit-north&from=2026-11-01&to=2026-11-16&infantId=inf-1');

    fireEvent.press(screen.getByRole('button', { name: /FHIR R4/ }));
    await waitFor(() => expect(screen.getByText('Saved fhir-inf-1-2026-11-01-2026-11-16.json.')).toBeTruthy());
    expect(requested[2]).toBe('/api/exports/fhir?unitId=unit-north&from=2026-11-01&to=2026-11-16&infantId=inf-1');
    expect(share).toHaveBeenLastCalledWith({ title: 'fhir-inf-1-2026-11-01-2026-11-16.json', message: '{"resourceType":"Bundle","type":"collection"}' });
    share.mockRestore();
  });

  it("without a date range, one infant's FHIR is the whole record and the readings button waits for a range", () => {
    expect(exportPaths({ unitId: 'unit-north', infantId: 'inf 1' })).toEqual({
      readings: null,
      flags: '/exports/flags.csv?status=all&unitId=unit-north&infantId=inf+1',
      fhir: '/exports/infants/inf%201/fhir',
    });
    renderButtons({ unitId: 'unit-north', infantId: 'inf-1' });
    expect(screen.getByRole('button', { name: /Readings CSV/ })).toBeDisabled();
    expect(screen.getByRole('button', { name: /FHIR R4/ })).toBeEnabled();
  });
});
