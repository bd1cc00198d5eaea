// SVG and PNG download buttons for a picture we draw as SVG (the graph, a chart): the PNG is the
// same SVG rasterised, so both files show the same thing.
import { downloadBlob, svgToPng } from "~/utils/graph-svg";

export function PictureDownloads({ svg, name }: { svg: () => string; name: string }) {
  return (
    <>
      <button type="button" className="btn px-2 py-1 text-xs" onClick={() => downloadBlob(new Blob([svg()], { type: "image/svg+xml" }), `${name}.svg`)}>
        SVG
      </button>
      <button type="button" className="btn px-2 py-1 text-xs" onClick={() => void svgToPng(svg()).then((png) => downloadBlob(png, `${name}.png`))}>
        PNG
      </button>
    </>
  );
}
