/** Thrown by query modules for expected refusals; route handlers and actions map `status` to HTTP or to a message. */
export class DomainError extends Error {
  constructor(
    public readonly status: 400 | 403 | 404 | 409 | 410 | 413 | 429,
    message: string,
  ) {
    super(message);
    this.name = "DomainError";
  }
}
