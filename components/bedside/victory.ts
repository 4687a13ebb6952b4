/**
 * The victory-native components the charts draw with, each from its own file. The package index
 * requires every chart type it ships (pie, candlestick, box plot, brush, zoom, voronoi…) and
 * Metro does not tree-shake, so importing the index roughly doubles the chart chunk.
 * Reached only through chart-plots.ts, which is loaded lazily.
 */
export { VictoryArea } from 'victory-native/lib/components/victory-area';
export { VictoryAxis } from 'victory-native/lib/components/victory-axis';
export { VictoryBar } from 'victory-native/lib/components/victory-bar';
export { VictoryChart } from 'victory-native/lib/components/victory-chart';
export { VictoryLine } from 'victory-native/lib/components/victory-line';
export { VictoryScatter } from 'victory-native/lib/components/victory-scatter';
