/**
 * The engine's one error type. `code` lets callers branch without parsing messages:
 * - "invalid": the netlist breaks the schema or the topology rules (message names element and field, or node);
 * - "convergence": Newton–Raphson and every fallback failed (message names the node/element and what was tried);
 * - "singular": the circuit matrix has no unique solution (message names the node or branch);
 * - "budget": the iteration or time budget ran out;
 * - "cancelled": the caller's `shouldStop` returned true.
 */
export type SimErrorCode = "invalid" | "convergence" | "singular" | "budget" | "cancelled";

export class SimError extends Error {
  readonly code: SimErrorCode;
  constructor(code: SimErrorCode, message: string) {
    super(message);
    this.name = "SimError";
    this.code = code;
  }
}

/** Predicate so callers can branch instead of catching by class across module/worker boundaries. */
export function isSimError(e: unknown): e is SimError {
  return (
    e instanceof SimError ||
    (typeof e === "object" && e !== null && (e as { name?: unknown }).name === "SimError" && typeof (e as { code?: unknown }).code === "string")
  );
}
