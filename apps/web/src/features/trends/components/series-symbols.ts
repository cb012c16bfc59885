/** SVG paths (10 × 10) of the trend series' chart symbols, for the legend. */
export const seriesSymbolPaths: Record<string, string> = {
  circle: 'M5 2a3 3 0 1 0 0.01 0z',
  triangle: 'M5 1.5 8.5 8 1.5 8z',
  rect: 'M2 2h6v6h-6z',
  diamond: 'M5 1 9 5 5 9 1 5z',
  roundRect: 'M3 2h4a1 1 0 0 1 1 1v4a1 1 0 0 1-1 1h-4a1 1 0 0 1-1-1v-4a1 1 0 0 1 1-1z',
  arrow: 'M5 1 8.5 9 5 7 1.5 9z',
};
