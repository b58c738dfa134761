import type { z } from 'zod';

export interface ErrorDetail {
  /** Where the problem is: body, query, params. */
  location?: string;
  /** Dotted path to the offending field, '' for the whole value. */
  path: string;
  message: string;
  code?: string;
}

/** An error the API answers with `{ error: { code, message, details? } }` and `status`. */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: ErrorDetail[],
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class ValidationError extends AppError {
  constructor(message = 'The request is not valid.', details?: ErrorDetail[], code = 'validation') {
    super(400, code, message, details);
  }

  /** From a failed zod parse of one part of the request. */
  static fromZod(location: 'body' | 'query' | 'params', error: z.ZodError): ValidationError {
    const details = error.issues.map((issue) => ({
      location,
      path: issue.path.map(String).join('.'),
      message: issue.message,
      code: issue.code,
    }));
    return new ValidationError(`The request ${location} is not valid.`, details);
  }
}

export class Unauthorized extends AppError {
  constructor(code = 'unauthenticated', message = 'Please sign in.') {
    super(401, code, message);
  }
}

export class Forbidden extends AppError {
  constructor(code = 'forbidden', message = 'You do not have permission to do this.') {
    super(403, code, message);
  }
}

export class NotFound extends AppError {
  constructor(code = 'not_found', message = 'Not found.') {
    super(404, code, message);
  }
}

export class Conflict extends AppError {
  constructor(code = 'conflict', message = 'This conflicts with the current state.') {
    super(409, code, message);
  }
}

export class PayloadTooLarge extends AppError {
  constructor(code = 'payload_too_large', message = 'The request body is too large.') {
    super(413, code, message);
  }
}

export class Unprocessable extends AppError {
  constructor(code = 'unprocessable', message = 'The request cannot be processed.', details?: ErrorDetail[]) {
    super(422, code, message, details);
  }
}

export class TooManyRequests extends AppError {
  constructor(code = 'rate_limited', message = 'Too many attempts. Please wait a few minutes and try again.') {
    super(429, code, message);
  }
}

export class ServiceUnavailable extends AppError {
  constructor(code = 'unavailable', message = 'The service is temporarily unavailable.') {
    super(503, code, message);
  }
}
