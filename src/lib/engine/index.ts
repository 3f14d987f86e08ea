// The engine's public API. Import from '$lib/engine' rather than from the modules inside.
export * from './types';
export * from './effects';
export { parseMapping, parseMappingText, mappingSchema, type Problem, type MappingResult } from './mapping';
export {
	clockSchema,
	parseSession,
	sessionEvents,
	sessionEventsSchema,
	sessionFromEvents,
	sessionReplay,
	sessionSchema,
	sessionStart,
	sessionStartRig,
	sessionStartSchema,
	type SessionResult
} from './session';
export { beatAt, constantClock, gridLine, tempoAt, timeAtBeat, withTempo, type TempoChange } from './clock';
export { FINDING_INFO, findingKind, numberedFinding, storedFinding, type FindingInfo } from './findings';
export { applyEvent, applyEvents, chainSounds, guardHolds, initialRigState, initialRack, isAudible } from './rig';
export { addressText, bindingName, inputName, racksOf } from './watch';
export { mappingReach, type RackReach } from './reach';
export { clockFor, engageAt, scheduleEvents, DEFAULT_TEMPO, type Clock, type Scheduled } from './schedule';
export { replay, runEvents, AudibleTracker, type ReplayOptions } from './replay';
export { analyze, whySilent } from './analyze';
export { lintMapping, LINT_RULES, type LintFinding, type LintRule } from './lint';
export {
	verifyGroup,
	verifyGroupSync,
	groupInputs,
	groupIds,
	type VerifyOptions,
	type VerifyProgress,
	type VerifyResult,
	PROOF_SCOPE
} from './verify';
export { onePressEffect, legatoRow, type OnePressOptions, type LegatoRowOptions, type LegatoVariant } from './builders';
export { DEMO_MAPPINGS, demoMapping, padGridProfile, padId, PAD_NOTE_BASE, type DemoMapping } from './demo';
export {
	rigMachine,
	type RigActorEvent,
	type RigActorInput,
	type RigChangesEmitted,
	type RigContext
} from './machines/rig';
export {
	parseDrill,
	drillSchema,
	scoreDrill,
	scoreSummary,
	sessionClock,
	sessionPresses,
	targetTime,
	drillDuration,
	matchDrill,
	BEATS_PER_BAR,
	MAX_TARGETS,
	MAX_DRILL_BARS,
	type DrillDocument,
	type DrillTarget,
	type Score,
	type ScoreSummary,
	type TargetOutcome
} from './score';
