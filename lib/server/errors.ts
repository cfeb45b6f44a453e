/** An error with an HTTP status that route handlers turn into a JSON reply in one place. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly issues?: Array<{ path: string; message: string }>,
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

export class UnauthorizedError extends ApiError {
  constructor(message = 'Sign in to continue.') {
    super(401, message);
  }
}

export class ForbiddenError extends ApiError {
  constructor(message = 'Your role in this study does not allow this.') {
    super(403, message);
  }
}

export class NotFoundError extends ApiError {
  constructor(message = 'Not found.') {
    super(404, message);
  }
}

export class ConflictError extends ApiError {
  constructor(message = 'Someone else changed this first. Reload to see their change.') {
    super(409, message);
  }
}

export class ValidationError extends ApiError {
  constructor(issues: Array<{ path: string; message: string }>, message = 'Some fields are invalid.') {
    super(422, message, issues);
  }
}

/**
 * 503 with Retry-After: a service the request needs (the shared Redis) cannot be reached now; the
 * same request succeeds once it is back.
 */
export class ServiceUnavailableError extends ApiError {
  constructor(
    message: string,
    readonly retryAfterS = 5,
  ) {
    super(503, message);
  }
}
