// Places complexes nobody has placed yet off the main thread: dagre over every linkage class of a
// 500-step mechanism took over a second on the page when the graph was first drawn.
import { complexLabel } from "./graph-model";
import { estimateNodeSize, placeComplexes, type PlacementInput } from "./layout";
import { answerLayoutRequests } from "./use-layout-worker";

answerLayoutRequests((input: Omit<PlacementInput, "sizeOf">) => placeComplexes({ ...input, sizeOf: (key) => estimateNodeSize(complexLabel(key)) }));
