/** A domain error with the HTTP status it maps to (see `toResponse` in lib/http/problem.ts). */
export class DomainError extends Error {
  constructor(
    message: string,
    readonly status: number,
    readonly title: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class UnauthorizedError extends DomainError {
  constructor(message = "Sign in or send a valid API key.") {
    super(message, 401, "Not signed in");
  }
}

export class ForbiddenError extends DomainError {
  constructor(message = "Your role does not allow this.") {
    super(message, 403, "Not allowed");
  }
}

export class NotFoundError extends DomainError {
  constructor(message = "Nothing was found at this address.") {
    super(message, 404, "Not found");
  }
}

/** A request that cannot be read at all (an address, a body or a call in no form we accept), with its own title. */
export class BadRequestError extends DomainError {
  constructor(message: string, title: string) {
    super(message, 400, title);
  }
}

export class ConflictError extends DomainError {
  constructor(message: string, extra: Record<string, unknown> = {}) {
    super(message, 409, "Conflict", extra);
  }
}

/** One problem in a request: which row (for batches), where (a JSON pointer) and what. */
export interface FieldProblem {
  row?: number;
  pointer: string;
  message: string;
}

export class ValidationError extends DomainError {
  constructor(
    message: string,
    readonly errors: FieldProblem[] = [],
  ) {
    super(message, 422, "Invalid input", { errors });
  }
}

export class PayloadTooLargeError extends DomainError {
  constructor(message: string) {
    super(message, 413, "Payload too large");
  }
}

export class RateLimitedError extends DomainError {
  constructor(
    message: string,
    readonly retryAfterSeconds: number,
  ) {
    super(message, 429, "Too many requests");
  }
}

/** The service is saturated for now (a full queue): the client should retry the same request later. */
export class BusyError extends DomainError {
  constructor(
    message: string,
    readonly retryAfterSeconds: number,
  ) {
    super(message, 503, "Busy");
  }
}
