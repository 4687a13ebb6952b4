/** A readings file the import screen shows as its example (the format is described in csv-formats.ts). Plain text, no zod. */
export const READINGS_EXAMPLE = [
  'infant,time,probe,remote,site,unit,mode,output,heart_rate',
  'N01,2026-11-16T08:00:00Z,36.6,36.8,axilla,C,skin-servo,40,148',
  'N02,2026-11-16T08:05:00Z,97.9,,,F,air-servo,,152',
].join('\n');
