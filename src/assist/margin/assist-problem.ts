import type { Band, Design, LimitMask } from '../../model/design.ts';
import { type Attribution, DEFAULT_BANDS } from '../../model/emissions-schema.ts';
import { estimateIssues } from '../../spectrum/noise-estimate.ts';
import type { Scan } from '../../spectrum/spectrum-types.ts';

/**
 * What every assistant judges a design by: the noise (one or more scans, or the design's noise
 * estimate), the limit masks, the target margin, the bands and, for a scan of unknown mode, its
 * attribution. Resolved once, with the same defaults as `analyzeEmissions` (the check command), so
 * an assistant's "meets the margin" is exactly the check command's pass.
 */

export type AssistNoise =
  /** One or more scans: a line scan of unknown mode, or the two outputs of a CM/DM separator. */
  | { readonly kind: 'scans'; readonly scans: readonly Scan[] }
  | { readonly kind: 'estimate' };

export interface AssistProblem {
  readonly design: Design;
  readonly noise: AssistNoise;
  readonly masks: readonly LimitMask[];
  readonly targetMarginDb: number;
  readonly bands: readonly Band[];
  /** How a scan of unknown mode is credited (default both: the smaller improvement). */
  readonly attribution: Attribution;
  readonly noiseFloorDbuV: number | undefined;
}

export interface AssistProblemOptions {
  readonly masks?: readonly LimitMask[];
  readonly targetMarginDb?: number;
  readonly attribution?: Attribution;
  readonly noiseFloorDbuV?: number;
}

/** A problem the assistants cannot work on, in words for the person who asked. */
export class AssistInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'AssistInputError';
  }
}

export function assistProblem(design: Design, noise: AssistNoise, options: AssistProblemOptions = {}): AssistProblem {
  const emissions = design.emissions;
  const masks = options.masks ?? emissions?.masks ?? [];
  if (masks.length === 0) throw new AssistInputError('no limit mask to judge against: add emissions.masks to the design or give limits');
  if (noise.kind === 'scans' && noise.scans.length === 0) throw new AssistInputError('no scan given');
  if (noise.kind === 'estimate') {
    const estimate = emissions?.estimate;
    if (!estimate || (!estimate.commonMode && !estimate.differentialMode)) {
      throw new AssistInputError('the design has no noise estimate (emissions.estimate) to work from');
    }
    const issues = estimateIssues(estimate);
    if (issues.length > 0) {
      throw new AssistInputError(issues.map((issue) => `emissions.estimate.${issue.path.join('.')}: ${issue.message}`).join('; '));
    }
  }
  return {
    design,
    noise,
    masks,
    targetMarginDb: options.targetMarginDb ?? emissions?.targetMarginDb ?? 6,
    bands: emissions?.bands ?? DEFAULT_BANDS.map((band) => ({ ...band })),
    attribution: options.attribution ?? emissions?.attribution ?? 'both',
    noiseFloorDbuV: options.noiseFloorDbuV ?? emissions?.noiseFloorDbuV,
  };
}
