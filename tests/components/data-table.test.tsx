/**
 * The report and review tables on a phone: every column is rendered (none cut off) inside a
 * sideways-scrolling view at least 96 px per column wide, so on a 390 px screen (a common phone
 * width) the last column is reached by scrolling rather than lost.
 */
import { render, screen } from '@testing-library/react-native';
import { ScrollView, StyleSheet } from 'react-native';
import { DataTable } from '@/components/reports/data-table';
import { ThemeProvider } from '@/components/theme/theme-provider';

const HEADER = ['Time', 'Probe', 'Remote site', 'Mode', 'Output', 'HR', 'By'];

describe('DataTable', () => {
  it('renders every column and row, and scrolls sideways wider than a 390 px phone', () => {
    const view = render(
      <ThemeProvider initial="light">
        <DataTable label="Readings around the event" header={HEADER} rows={[['16 Nov, 08:40', '36.9 °C', '36.2 °C axilla', 'skin-servo', '40 %', '150', 'Nia Okafor']]} />
      </ThemeProvider>,
    );
    for (const h of HEADER) expect(screen.getByText(h)).toBeTruthy();
    expect(screen.getByText('Nia Okafor')).toBeTruthy();
    const scroller = view.UNSAFE_getByType(ScrollView);
    expect(scroller.props.horizontal).toBe(true);
    const minWidth = StyleSheet.flatten(scroller.props.contentContainerStyle).minWidth as number;
    expect(minWidth).toBe(HEADER.length * 96);
    expect(minWidth).toBeGreaterThan(390);
  });

  it('says when there is nothing to show', () => {
    render(
      <ThemeProvider initial="light">
        <DataTable label="Trends" header={['Period', 'Checks']} rows={[]} empty="No flags in this range." />
      </ThemeProvider>,
    );
    expect(screen.getByText('No flags in this range.')).toBeTruthy();
  });
});
