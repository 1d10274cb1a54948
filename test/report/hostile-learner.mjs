// A module learner for the safety test of the tune page only: the nearest-centroid example
// (examples/external/centroid-learner.mjs) with one more option, `mode`, whose values are
// hostile markup. The option changes nothing in the fit; it only puts markup into candidate
// specs and option values.
import centroid from '../../examples/external/centroid-learner.mjs';

export const HOSTILE_MODES = ['<script>alert(8)</script>', 'a"b', 'x&y', '</svg><b>'];

export default {
  ...centroid,
  params: [...centroid.params, { name: 'mode', kind: 'choice', choices: HOSTILE_MODES, default: 'x&y', doc: 'hostile option values (test only)' }],
  doc: 'nearest class centroid with a hostile option (test only)',
};
