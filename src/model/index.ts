/** The design document: types, schema, validation, engineering units. */
export type * from './design.ts';
export { designSchema, DESIGN_FORMAT, DESIGN_VERSION, MAX_SWEEP_POINTS, PLACEMENTS } from './design-schema.ts';
export { readDesign, readDesignJson, requireDesign, toValidationIssue, type ReadResult } from './read-design.ts';
export { ValidationError, formatIssue, formatPath, type ValidationIssue, type ValidationCode } from './validation-error.ts';
export { parseQuantity, formatQuantity, type UnitSymbol } from './units.ts';
export { DETECTORS, ATTRIBUTIONS, DEFAULT_BANDS, limitMaskSchema, type Detector, type Attribution } from './emissions-schema.ts';
export { NOISE_SOURCE_PRESETS, type NoiseSourcePresetId } from './noise-source-presets.ts';
