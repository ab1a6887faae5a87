import { z } from 'zod';
import { emissionsFields } from './emissions-schema.ts';
import { optionalQuantity, quantity, quantityOr } from './quantity-field.ts';
import { partCoreSchema, safetySchema } from './safety-schema.ts';

/**
 * The design file, version 2. Every physical value is SI (H, F, Ω, Hz, V, A) when written as a
 * number, or engineering text ("4.7 mH") when written as a string. Parasitics are optional and
 * zero by default. docs/design-format.md documents every field; a test keeps the two in step.
 */

export const DESIGN_FORMAT = 'chokepoint-design';
export const DESIGN_VERSION = 2;

const identifier = z
  .string()
  .regex(/^[A-Za-z][A-Za-z0-9_-]{0,63}$/u, 'an id starts with a letter and holds letters, digits, "-" or "_" (64 at most)');
const label = z.string().max(200);

export const permeabilitySchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('constant') }),
  z.strictObject({
    kind: z.literal('first-order-relaxation'),
    /** µ(f) = µi / (1 + j f/fr): at fr the real part has halved (|µ| is down by √2) and the loss part peaks. */
    relaxationFrequencyHz: quantity('Hz'),
  }),
]);

export const coreLossSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('none') }),
  z.strictObject({ kind: z.literal('parallel-resistance'), resistance: quantity('Ω') }),
  z.strictObject({ kind: z.literal('quality-factor'), qualityFactor: quantity(''), atFrequencyHz: quantity('Hz') }),
]);

export const capacitorSchema = z.strictObject({
  kind: z.literal('capacitor'),
  capacitance: quantity('F'),
  esr: quantityOr(0, 'Ω'),
  esl: quantityOr(0, 'H'),
  safetyClass: z.enum(['X1', 'X2', 'Y1', 'Y2', 'Y4', 'none']).default('none'),
  ratedVoltage: optionalQuantity('V'),
});

export const inductorSchema = z.strictObject({
  kind: z.literal('inductor'),
  inductance: quantity('H'),
  dcr: quantityOr(0, 'Ω'),
  windingCapacitance: quantityOr(0, 'F'),
  coreLoss: coreLossSchema.default({ kind: 'none' }),
  permeability: permeabilitySchema.default({ kind: 'constant' }),
  ratedCurrent: optionalQuantity('A'),
  /** Core data for the saturation check (version 2). */
  core: partCoreSchema.optional(),
});

export const resistorSchema = z.strictObject({
  kind: z.literal('resistor'),
  resistance: quantity('Ω', 'non-negative'),
  seriesInductance: quantityOr(0, 'H'),
});

export const ferriteBeadSchema = z.strictObject({
  kind: z.literal('ferrite-bead'),
  /** Peak loss resistance of the R ∥ L ∥ C core model. */
  resistance: quantity('Ω'),
  inductance: quantity('H'),
  capacitance: quantityOr(0, 'F'),
  dcResistance: quantityOr(0, 'Ω'),
  ratedCurrent: optionalQuantity('A'),
});

export const dampingRcSchema = z.strictObject({
  kind: z.literal('damping-rc'),
  resistance: quantity('Ω', 'non-negative'),
  capacitance: quantity('F'),
});

export const dampingRlSchema = z.strictObject({
  kind: z.literal('damping-rl'),
  resistance: quantity('Ω'),
  inductance: quantity('H'),
});

export const measuredOriginSchema = z.strictObject({
  format: z.enum(['impedance-table', 'touchstone-series-thru', 'touchstone-shunt-thru', 'touchstone-reflection', 'touchstone-one-port-impedance']),
  fileName: z.string().max(260).optional(),
  referenceImpedance: optionalQuantity('Ω'),
});

/** Columns of equal length, frequency strictly rising. Interpolated on log f; held and flagged outside. */
export const impedanceTableSchema = z
  .strictObject({
    frequencyHz: z.array(z.number().positive()).min(2).max(100_000),
    magnitudeOhm: z.array(z.number().positive()).min(2).max(100_000),
    phaseDeg: z.array(z.number().min(-180).max(180)).min(2).max(100_000),
  })
  .superRefine((table, ctx) => {
    const n = table.frequencyHz.length;
    for (const key of ['magnitudeOhm', 'phaseDeg'] as const) {
      if (table[key].length !== n) {
        ctx.addIssue({ code: 'custom', path: [key], message: `has ${table[key].length} values but frequencyHz has ${n}` });
      }
    }
    for (let i = 1; i < n; i += 1) {
      if (!(table.frequencyHz[i]! > table.frequencyHz[i - 1]!)) {
        ctx.addIssue({ code: 'custom', path: ['frequencyHz', i], message: 'frequencies must rise strictly' });
        break;
      }
    }
  });

export const measuredSchema = z.strictObject({
  kind: z.literal('measured'),
  table: impedanceTableSchema,
  origin: measuredOriginSchema.optional(),
});

/** Parts with two terminals; any of them can sit in series, across the lines or to ground. */
export const twoTerminalSchema = z.discriminatedUnion('kind', [
  capacitorSchema,
  inductorSchema,
  resistorSchema,
  ferriteBeadSchema,
  dampingRcSchema,
  dampingRlSchema,
  measuredSchema,
]);

export const couplingSchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('leakage-inductance'),
    /** Per winding: L − M. The differential loop sees twice this. */
    leakageInductance: quantity('H', 'non-negative'),
  }),
  z.strictObject({
    kind: z.literal('coupling-factor'),
    couplingFactor: z.number().gt(0, 'a coupling factor is above 0').lte(1, 'a coupling factor is at most 1'),
  }),
]);

export const commonModeChokeSchema = z.strictObject({
  kind: z.literal('common-mode-choke'),
  /** Self-inductance of each winding at low frequency. */
  inductance: quantity('H'),
  coupling: couplingSchema,
  dcr: quantityOr(0, 'Ω'),
  /** Across each winding, terminal to terminal. */
  windingCapacitance: quantityOr(0, 'F'),
  /** Core and winding loss as a resistance across each winding; absent means none. */
  parallelResistance: optionalQuantity('Ω'),
  permeability: permeabilitySchema.default({ kind: 'constant' }),
  ratedCurrent: optionalQuantity('A'),
  ratedVoltage: optionalQuantity('V'),
  /** Core data for the saturation check (version 2). */
  core: partCoreSchema.optional(),
});

export const partSchema = z.discriminatedUnion('kind', [
  capacitorSchema,
  inductorSchema,
  resistorSchema,
  ferriteBeadSchema,
  dampingRcSchema,
  dampingRlSchema,
  measuredSchema,
  commonModeChokeSchema,
]);

/**
 * A part's manufacturing tolerance for the yield assistant (version 2): ± percent of its main value,
 * spread uniformly or normally (±percent as 3σ), and for magnetic parts the band the permeability
 * moves over the operating temperature. docs/assistants.md gives the defaults by part kind.
 */
export const toleranceSchema = z
  .strictObject({
    percent: z.number().min(0, 'a tolerance is 0 % or more').max(90, 'a tolerance is at most 90 %'),
    distribution: z.enum(['uniform', 'normal']).default('uniform'),
    permeabilityLowPercent: z.number().min(-90).max(0).optional(),
    permeabilityHighPercent: z.number().min(0).max(200).optional(),
  })
  .superRefine((tolerance, ctx) => {
    if ((tolerance.permeabilityLowPercent === undefined) !== (tolerance.permeabilityHighPercent === undefined)) {
      ctx.addIssue({ code: 'custom', path: ['permeabilityHighPercent'], message: 'give both ends of the permeability band, or neither' });
    }
  });

export const PLACEMENTS = [
  'series-line1',
  'series-line2',
  'line-to-line',
  'line1-to-ground',
  'line2-to-ground',
  'both-lines-coupled',
] as const;

export const elementSchema = z
  .strictObject({
    id: identifier,
    label: label.optional(),
    placement: z.enum(PLACEMENTS),
    enabled: z.boolean().default(true),
    part: partSchema,
    /** Manufacturing tolerance for the yield assistant (version 2); defaults by part kind when absent. */
    tolerance: toleranceSchema.optional(),
  })
  .superRefine((element, ctx) => {
    const isChoke = element.part.kind === 'common-mode-choke';
    if (isChoke && element.placement !== 'both-lines-coupled') {
      ctx.addIssue({ code: 'custom', path: ['placement'], message: 'a common-mode choke sits in both lines: use "both-lines-coupled"' });
    }
    if (!isChoke && element.placement === 'both-lines-coupled') {
      ctx.addIssue({ code: 'custom', path: ['placement'], message: '"both-lines-coupled" is for a common-mode choke only' });
    }
    if (element.part.kind === 'common-mode-choke' && element.part.coupling.kind === 'leakage-inductance') {
      if (!(element.part.coupling.leakageInductance < element.part.inductance)) {
        ctx.addIssue({
          code: 'custom',
          path: ['part', 'coupling', 'leakageInductance'],
          message: 'leakage inductance must be below the winding inductance',
        });
      }
    }
  });

export const stageSchema = z.strictObject({
  id: identifier,
  label: label.optional(),
  /** Ordered from the noise-source side to the receiving-network side. */
  elements: z.array(elementSchema).max(64),
});

export const receiverSchema = z.discriminatedUnion('kind', [
  /** CISPR 16-1-2 V-network: 50 Ω ∥ (50 µH + 5 Ω). */
  z.strictObject({ kind: z.literal('cispr16-mains-50uh') }),
  /** 50 Ω ∥ 5 µH network used for vehicle components. */
  z.strictObject({ kind: z.literal('vehicle-5uh') }),
  z.strictObject({ kind: z.literal('resistive'), resistance: quantityOr(50, 'Ω', 'positive') }),
  z.strictObject({ kind: z.literal('custom'), impedance: twoTerminalSchema, label: label.optional() }),
]);

export const noiseSourceModeSchema = z.strictObject({
  impedance: twoTerminalSchema,
  /** Which preset filled this in, if any; informational only. */
  preset: z.string().max(80).optional(),
});

export const noiseSourceSchema = z.strictObject({
  /** From the midpoint of the two lines to ground. */
  commonMode: noiseSourceModeSchema,
  /** Line to line, split equally into the two lines about the midpoint. */
  differentialMode: noiseSourceModeSchema,
});

/**
 * The filter that was fitted when a scan was taken: none, or stages of the same shape as the
 * design's (same noise source and receivers). Predictions scale the scan by T_new / T_baseline.
 */
export const baselineSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('none') }),
  z.strictObject({ kind: z.literal('stages'), label: label.optional(), stages: z.array(stageSchema).max(32) }),
]);

export const emissionsSchema = z
  .strictObject({
    ...emissionsFields,
    baseline: baselineSchema.default({ kind: 'none' }),
  })
  .superRefine((emissions, ctx) => {
    const maskIds = new Map<string, number>();
    emissions.masks.forEach((mask, m) => {
      const other = maskIds.get(mask.id);
      if (other !== undefined) {
        ctx.addIssue({ code: 'custom', path: ['masks', m, 'id'], message: `id "${mask.id}" is already used at masks[${other}]`, params: { code: 'duplicate-id' } });
      } else maskIds.set(mask.id, m);
    });
    emissions.bands.forEach((band, b) => {
      if (!(band.stopHz > band.startHz)) {
        ctx.addIssue({ code: 'custom', path: ['bands', b, 'stopHz'], message: `stop (${band.stopHz} Hz) must be above start (${band.startHz} Hz)` });
      }
    });
    if (emissions.baseline.kind === 'stages') {
      const seen = new Map<string, string>();
      emissions.baseline.stages.forEach((stage, s) => {
        for (const [id, where, path] of [
          [stage.id, `baseline.stages[${s}]`, ['baseline', 'stages', s, 'id']] as const,
          ...stage.elements.map((element, e) => [element.id, `baseline.stages[${s}].elements[${e}]`, ['baseline', 'stages', s, 'elements', e, 'id']] as const),
        ]) {
          const other = seen.get(id);
          if (other) ctx.addIssue({ code: 'custom', path: [...path], message: `id "${id}" is already used at ${other}`, params: { code: 'duplicate-id' } });
          else seen.set(id, where);
        }
      });
    }
  });

/**
 * The conditions the product runs under (version 2): the supply, the line current at full load and
 * the converter behind the filter. The filter's response does not depend on them; the safety checks
 * (leakage current, discharge, voltage stress, copper loss, saturation) and the stability assistant
 * read them. Absent until the user gives them; never guessed.
 */
export const supplySchema = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('ac-mains'),
    /** The highest rated line voltage, rms, line to neutral (e.g. 264 V for a 100–240 V product with +10 %). */
    highestVoltage: quantity('V'),
    /** The highest rated line frequency (60 Hz for a 50/60 Hz product). */
    highestFrequencyHz: quantity('Hz'),
  }),
  z.strictObject({
    kind: z.literal('dc'),
    /** The highest DC input voltage. */
    highestVoltage: quantity('V'),
  }),
]);

export const converterSchema = z.strictObject({
  /** The lowest input voltage at which the converter still delivers full power. */
  lowestInputVoltage: quantity('V'),
  /** The converter's highest input power. */
  highestInputPower: quantity('W'),
});

export const operatingSchema = z.strictObject({
  supply: supplySchema.optional(),
  /** The rms line current at full load, through every series part. */
  lineCurrent: optionalQuantity('A'),
  converter: converterSchema.optional(),
});

export const MAX_SWEEP_POINTS = 1_000_000;

export const frequencyPlanSchema = z
  .strictObject({
    startHz: quantityOr(9e3, 'Hz', 'positive'),
    stopHz: quantityOr(108e6, 'Hz', 'positive'),
    pointsPerDecade: z.number().int('points per decade is a whole number').positive().max(100_000).default(200),
  })
  .superRefine((plan, ctx) => {
    if (!(plan.stopHz > plan.startHz)) {
      ctx.addIssue({ code: 'custom', path: ['stopHz'], message: `stop (${plan.stopHz} Hz) must be above start (${plan.startHz} Hz)` });
      return;
    }
    const points = Math.log10(plan.stopHz / plan.startHz) * plan.pointsPerDecade + 2;
    if (points > MAX_SWEEP_POINTS) {
      ctx.addIssue({
        code: 'custom',
        path: ['pointsPerDecade'],
        message: `the plan asks for about ${Math.round(points)} points; at most ${MAX_SWEEP_POINTS} are allowed`,
        params: { code: 'out-of-range' },
      });
    }
  });

export const designSchema = z
  .strictObject({
    format: z.literal(DESIGN_FORMAT),
    version: z.literal(DESIGN_VERSION),
    name: label.min(1),
    description: z.string().max(10_000).default(''),
    frequencyPlan: frequencyPlanSchema.default({ startHz: 9e3, stopHz: 108e6, pointsPerDecade: 200 }),
    noiseSource: noiseSourceSchema,
    receivers: z.strictObject({ line1: receiverSchema, line2: receiverSchema }),
    stages: z.array(stageSchema).max(32),
    /** Limits, margin, bands, scan attribution, baseline and noise estimate; absent until used. */
    emissions: emissionsSchema.optional(),
    /** Supply, line current and converter (version 2); absent until used. */
    operating: operatingSchema.optional(),
    /** The safety checks' choices: leakage limit, discharge requirement, tolerances (version 2); absent until used. */
    safety: safetySchema.optional(),
  })
  .superRefine((design, ctx) => {
    const seen = new Map<string, string>();
    design.stages.forEach((stage, s) => {
      const stageWhere = `stages[${s}]`;
      const clash = seen.get(stage.id);
      if (clash) ctx.addIssue({ code: 'custom', path: ['stages', s, 'id'], message: `id "${stage.id}" is already used at ${clash}`, params: { code: 'duplicate-id' } });
      else seen.set(stage.id, stageWhere);
      stage.elements.forEach((element, e) => {
        const where = `${stageWhere}.elements[${e}]`;
        const other = seen.get(element.id);
        if (other) {
          ctx.addIssue({ code: 'custom', path: ['stages', s, 'elements', e, 'id'], message: `id "${element.id}" is already used at ${other}`, params: { code: 'duplicate-id' } });
        } else seen.set(element.id, where);
      });
    });
  });
