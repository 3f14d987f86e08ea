// The engine's public API. Import from '$lib/engine' rather than from the modules inside.
export * from './types';
export * from './effects';
export { parseMapping, parseMappingText, mappingSchema, type Problem, type MappingResult } from './mapping';
export { applyEvent, applyEvents, initialRigState, initialRack, isAudible } from './rig';
export { onePressEffect, legatoRow, type OnePressOptions, type LegatoRowOptions, type LegatoVariant } from './builders';
export { DEMO_MAPPINGS, demoMapping, padGridProfile, padId, PAD_NOTE_BASE, type DemoMapping } from './demo';
