/**
 * Walking speeds and start-time assumptions of the egress routes. None of these is measured for a given site:
 * the officer can override them per request, and drills measure the real times.
 */

/**
 * Unimpeded walking speed on the level, m/s. Common practice in egress engineering: about 1.2 m/s for adults
 * walking freely (figures of 1.2–1.3 m/s are usual in fire-engineering hand calculations) [from memory, no
 * verified source in the reference sheet].
 */
export const WALK_SPEED_M_S = 1.2

/**
 * Slower speed for people with reduced mobility (walking aids, wheelchairs pushed by a helper), m/s. Commonly
 * quoted figures are 0.5–0.8 m/s; 0.6 m/s is used here [from memory, unverified: check locally].
 */
export const REDUCED_MOBILITY_SPEED_M_S = 0.6

/**
 * From a detector crossing its set point to people starting to walk, s: sensor response, signalling and a
 * short pre-movement. The same figure as the plan rules' alarm-heard lag (shared/plans/rules.ts DETECTOR_LAG_S),
 * common practice, stated so that it can be changed.
 */
export const REACTION_S = 30

/**
 * When no detector alarms, people leave when someone notices the gas. 120 s is Driftwarden's stated default,
 * an assumption and not a measured value: the officer sets the discovery time for the floor in question.
 */
export const DEFAULT_DISCOVERY_S = 120

/** Along-route sampling step, m: fine enough to see a 0.5 m cell twice. */
export const SAMPLE_STEP_M = 0.25
