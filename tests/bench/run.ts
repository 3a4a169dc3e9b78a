/** `npm run bench`: the estimation, planning and simulator benchmarks, ratios measured in one run. */
import { runStepperBench } from "../../simulators/stepper-bench";
import { runFilterBench } from "./filter-bench";
import { runPlannerBench } from "./planner-bench";

await runFilterBench();
await runPlannerBench();
await runStepperBench();
