/** An expected failure of a route handler, answered as JSON `{ error, fieldErrors? }` with this status. */
export class ApiError extends Error {
  constructor(
    public readonly status: number,
    message: string,
    public readonly fieldErrors?: Record<string, string[]>,
  ) {
    super(message);
    this.name = "ApiError";
  }
}
