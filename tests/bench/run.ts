/** `npm run bench`: the estimation and planning benchmarks, ratios measured in one run. */
import { runFilterBench } from "./filter-bench";
import { runPlannerBench } from "./planner-bench";

await runFilterBench();
await runPlannerBench();
