// The feasibility engine (issue 4): the public entry point of lib/engine.
export { compileDevice, compileHarvestExpression, DeviceError, PLAUSIBILITY_CAP_FACTOR, type CompiledDevice } from "./device";
export { requiredWindows, daylightIntervals, geometricAltitudeDeg } from "./sun";
export { prepareStudy, studySeries, StudyInputError, type StudyContext, type StudyInput, type PreparedStudy } from "./prepare";
export { runStudy, studyResult, simulate, MAX_SUBSTEP_SECONDS, REPORTABLE_OUTAGE_SECONDS } from "./simulate";
export { decideVerdict, studyVerdict, mergePolicy, formatPercent } from "./verdict";
export { solveMinStorage, solveMaxMinCurrent, type SolverResult } from "./solvers";
export { decimateForChart, type ChartData, type ChartRange } from "./timeline";
export { ENGINE_VERSION } from "./figures";
