// How a chart tells series apart: twelve hues of our own that hold up on the light and the dark
// canvas, then the same hues again with dashes, dots and dash-dots, so 48 series never share a look.
const colours = [
  "#0f8a8c", "#c4622d", "#5b6fd6", "#b8860b", "#a14fa8", "#3f8f3a",
  "#cf4866", "#4a90b8", "#8a6d3b", "#6b7c3a", "#7a5cc0", "#d07c9a",
];

/** Dash patterns in pixels (on, off, …); the first is a solid line. */
const dashes: number[][] = [[], [9, 4], [2, 3], [10, 3, 2, 3]];

export interface SeriesLook {
  colour: string;
  dash: number[];
}

export function seriesLook(index: number): SeriesLook {
  return { colour: colours[index % colours.length], dash: dashes[Math.floor(index / colours.length) % dashes.length] };
}
