import { feverBand, temperatureBand, TEMPERATURE_BANDS, toCentiCelsius } from '../../../shared/thermal';

describe('remote-site temperature bands (WHO 1997 via Miller 2011; NHS GG&C)', () => {
  it.each([
    [36.5, 'normal', 'WHO 1997 via Miller 2011: 36.5 is the lowest normal'],
    [36.4, 'cold-stress', 'WHO 1997 via Miller 2011: 36.0–36.4 cold stress'],
    [36.45, 'cold-stress', 'WHO 1997 via Miller 2011, read half-open on the hundredth: 36.45 is below 36.5'],
    [36.0, 'cold-stress', 'WHO 1997 via Miller 2011: 36.0 is cold stress'],
    [35.9, 'moderate-hypothermia', 'WHO 1997 via Miller 2011: 32.0–35.9 moderate'],
    [32.0, 'moderate-hypothermia', 'WHO 1997 via Miller 2011: 32.0 is moderate'],
    [31.9, 'severe-hypothermia', 'WHO 1997 via Miller 2011: below 32.0 severe'],
    [37.5, 'normal', 'WHO 1997 via Miller 2011; NHS GG&C: 37.5 is the highest normal'],
    [37.51, 'hyperthermia', 'WHO 1997 via later tables; NHS GG&C: above 37.5'],
    [37.6, 'hyperthermia', 'WHO 1997 via later tables; NHS GG&C: above 37.5'],
  ])('%s °C → %s (%s)', (celsius, band) => {
    expect(temperatureBand(toCentiCelsius(celsius, 'C'))).toBe(band);
  });

  it('the band table covers every hundredth once, coldest first', () => {
    for (let centi = 2000; centi <= 4500; centi += 1) {
      const matching = TEMPERATURE_BANDS.filter((info) => (info.minCenti === null || centi >= info.minCenti) && (info.maxCenti === null || centi <= info.maxCenti));
      expect(matching.map((info) => info.band)).toEqual([temperatureBand(centi)]);
    }
  });

  it('refuses a non-integer value: stored values are whole hundredths (common practice)', () => {
    expect(() => temperatureBand(36.5)).toThrow();
  });
});

describe('axillary fever bands (Bedside Clinical Guidelines Partnership)', () => {
  it.each([
    [3750, 'none'],
    [3759, 'none'],
    [3760, 'low-grade-fever'],
    [3799, 'low-grade-fever'],
    [3800, 'fever'],
    [3900, 'fever'],
  ])('%i → %s', (centi, band) => {
    expect(feverBand(centi)).toBe(band);
  });
});
