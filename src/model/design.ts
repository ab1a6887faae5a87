import type { z } from 'zod';
import type {
  capacitorSchema,
  commonModeChokeSchema,
  dampingRcSchema,
  dampingRlSchema,
  designSchema,
  elementSchema,
  ferriteBeadSchema,
  frequencyPlanSchema,
  impedanceTableSchema,
  inductorSchema,
  measuredSchema,
  noiseSourceSchema,
  partSchema,
  PLACEMENTS,
  receiverSchema,
  resistorSchema,
  stageSchema,
  twoTerminalSchema,
  emissionsSchema,
  baselineSchema,
  converterSchema,
  operatingSchema,
  supplySchema,
  toleranceSchema,
} from './design-schema.ts';
import type { limitMaskSchema, noiseEstimateSchema, bandSchema, trapezoidSchema } from './emissions-schema.ts';
import type { biasCurveSchema, dischargeRequirementSchema, leakageLimitSchema, partCoreSchema, safetySchema } from './safety-schema.ts';

/** A design after validation: every physical value is an SI number, defaults filled in. */
export type Design = z.output<typeof designSchema>;
/** What a design file may hold before validation (numbers or engineering text, defaults absent). */
export type DesignInput = z.input<typeof designSchema>;

export type Stage = z.output<typeof stageSchema>;
export type FilterElement = z.output<typeof elementSchema>;
export type Placement = (typeof PLACEMENTS)[number];
export type Part = z.output<typeof partSchema>;
export type TwoTerminalPart = z.output<typeof twoTerminalSchema>;
export type Capacitor = z.output<typeof capacitorSchema>;
export type Inductor = z.output<typeof inductorSchema>;
export type Resistor = z.output<typeof resistorSchema>;
export type FerriteBead = z.output<typeof ferriteBeadSchema>;
export type DampingRc = z.output<typeof dampingRcSchema>;
export type DampingRl = z.output<typeof dampingRlSchema>;
export type MeasuredImpedance = z.output<typeof measuredSchema>;
export type ImpedanceTable = z.output<typeof impedanceTableSchema>;
export type CommonModeChoke = z.output<typeof commonModeChokeSchema>;
export type Receiver = z.output<typeof receiverSchema>;
export type NoiseSource = z.output<typeof noiseSourceSchema>;
export type FrequencyPlan = z.output<typeof frequencyPlanSchema>;
export type PartKind = Part['kind'];
export type Emissions = z.output<typeof emissionsSchema>;
export type Baseline = z.output<typeof baselineSchema>;
export type Operating = z.output<typeof operatingSchema>;
export type Supply = z.output<typeof supplySchema>;
export type Converter = z.output<typeof converterSchema>;
export type Tolerance = z.output<typeof toleranceSchema>;
export type LimitMask = z.output<typeof limitMaskSchema>;
export type LimitMaskInput = z.input<typeof limitMaskSchema>;
export type NoiseEstimate = z.output<typeof noiseEstimateSchema>;
export type Band = z.output<typeof bandSchema>;
export type Trapezoid = z.output<typeof trapezoidSchema>;
export type SafetyChoices = z.output<typeof safetySchema>;
export type SafetyChoicesInput = z.input<typeof safetySchema>;
export type LeakageLimitChoice = z.output<typeof leakageLimitSchema>;
export type DischargeRequirementChoice = z.output<typeof dischargeRequirementSchema>;
export type PartCore = z.output<typeof partCoreSchema>;
export type BiasCurve = z.output<typeof biasCurveSchema>;
