/**
 * The engine's output version: bump it whenever a change to shared/engine (or to how runs are built and summarized)
 * changes any stored number. Every stored result records the version it was computed with; plans built on results of
 * an older version are marked stale (server/services/staleness.service.ts). Purely cosmetic or bit-identical changes
 * (refactors, speed-ups that keep the output) leave it alone.
 *
 * 1: the engine as of 2 Dec 2026 (results stored before versions were recorded count as 1).
 * 2: issue 12: step control that sees advection, sinks and transfer air (trapezoidal defect), Crank-Nicolson on
 *    advective faces at Courant ≤ 1, smaller first steps after a puff; sources spread trilinearly (not snapped)
 *    and the further changes of that session listed in shared/engine/README.md.
 */
export const ENGINE_VERSION = 2
