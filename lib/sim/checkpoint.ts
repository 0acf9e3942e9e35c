/**
 * Budget and cancellation, one way for every loop: the Newton iterations, the transient's steps, the AC frequencies,
 * the DC sweep's points and the LU's ordering and factorisation (through StaticLU.poll). Each loop calls
 * checkpoint(c) every few turns (every DC-sweep point, every 8th step or frequency, every 32nd Newton iteration,
 * every 64 LU columns: a clock read is ~0.1 µs, so it is spread over turns that cost more), so a run stops within a
 * few turns of its deadline or of the caller's shouldStop returning true.
 */
import type { Circuit } from "./circuit";
import { SimError } from "./errors";

/** Throws SimError "cancelled" when the caller's shouldStop returns true, "budget" once the deadline has passed. */
export function checkpoint(c: Circuit): void {
  if (c.shouldStop?.()) throw new SimError("cancelled", "Simulation cancelled");
  if (performance.now() > c.deadline) {
    throw new SimError("budget", `Time budget exhausted after ${c.newtonIterations} Newton iterations`);
  }
}
