// Series colours for charts: distinct hues that hold up on both the light and the dark canvas.
const colours = ["#0f8a8c", "#c4622d", "#5b6fd6", "#b8860b", "#a14fa8", "#3f8f3a", "#cf4866", "#4a90b8", "#8a6d3b", "#6b7c3a"];

export function seriesColour(index: number): string {
  return colours[index % colours.length];
}
