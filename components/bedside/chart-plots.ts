/**
 * The one module that brings in victory-native, and it is only ever loaded with import().
 *
 * Expo's web bundler moves every module that two split chunks share into `__common`, which
 * index.html loads before any route. When the flowsheet and the reports each imported victory,
 * the whole charting stack (victory, d3, lodash: about 120 KiB gzip) landed in every first load,
 * sign-in included. Funnelling both charts through this module gives victory exactly one chunk,
 * fetched when a chart is about to be shown. Import it only as `import('./chart-plots')` (or
 * `import type`): one static import anywhere puts victory back into the first load.
 */
export { TrendPlot } from './trend-plot';
export { OnTimePlot } from '@/components/reports/on-time-plot';
