/**
 * The cautions every report, hover of a check and the README carry. Results are elastic,
 * prismatic-beam estimates; the tool never supplies a code limit.
 */
export const CAUTION_SHORT =
  'Elastic estimate from tau = VQ/(It). Verify against the governing design code and have the work checked by a licensed engineer.';

export const CAUTION_LONG = [
  'Results are elastic, prismatic-beam estimates from tau = VQ/(It): the average shear stress across the width at each height.',
  'Web shear buckling, shear lag, local and connection effects, and load factors are outside this method; verify against the governing design code.',
  'Limits in checks are written by the engineer; this tool supplies none.',
  'Have the work checked by a licensed engineer where the structure is built.',
];
