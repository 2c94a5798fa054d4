/**
 * Typed errors thrown by domain code and mapped to a status once, at the
 * boundary (lib/http.ts for routes, lib/action-result.ts for server actions).
 */
export type FieldErrors = Record<string, string[]>;

export class DomainError extends Error {
  constructor(
    message: string,
    readonly status: 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429,
    readonly fieldErrors?: FieldErrors,
  ) {
    super(message);
    this.name = new.target.name;
  }
}

/** No session, or the session's user is gone or deactivated. */
export class UnauthenticatedError extends DomainError {
  constructor(message = "Sign in to continue.") {
    super(message, 401);
  }
}

/** Signed in, but the role or unit does not allow this. */
export class ForbiddenError extends DomainError {
  constructor(message = "Your role does not allow this action.") {
    super(message, 403);
  }
}

/**
 * The password an administrator set has not been changed yet: nothing but the
 * change-password page and its route is open until it is (lib/accounts).
 */
export class PasswordChangeRequiredError extends ForbiddenError {
  constructor() {
    super(
      "Set a password of your own first: the one you signed in with was set by an administrator. Open /change-password.",
    );
  }
}

export class NotFoundError extends DomainError {
  constructor(message = "Not found.") {
    super(message, 404);
  }
}

/** Input refused; carries the field paths so forms can show errors beside each field. */
export class ValidationError extends DomainError {
  constructor(message: string, fieldErrors: FieldErrors = {}) {
    super(message, 400, fieldErrors);
  }
}

/** Someone else changed the record first, or a unique value is taken. */
export class ConflictError extends DomainError {
  constructor(message: string, fieldErrors?: FieldErrors) {
    super(message, 409, fieldErrors);
  }
}

/** Too many attempts: try again after `retryAfterSeconds` (the Retry-After header). */
export class TooManyRequestsError extends DomainError {
  constructor(
    message: string,
    readonly retryAfterSeconds: number,
    fieldErrors?: FieldErrors,
  ) {
    super(message, 429, fieldErrors);
  }
}

/**
 * Engine input errors (lib/oxygen stays free of app imports) become a 400
 * naming the field and its range, or the words it accepts.
 */
export function fromEngineError(error: unknown): DomainError | undefined {
  if (
    error instanceof Error &&
    (error.name === "OxygenInputError" || error.name === "OxygenChoiceError") &&
    "field" in error &&
    typeof error.field === "string"
  ) {
    return new ValidationError(error.message, { [error.field]: [error.message] });
  }
  return undefined;
}
