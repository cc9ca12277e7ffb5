// Errors the services throw; pages show them beside the form, the API turns them into problem+json.
export class NotFoundError extends Error {
  constructor(what: string) {
    super(`${what} was not found in your organisation.`);
  }
}

/** A rule on the input that zod cannot see (e.g. a name already used); `path` names the field. */
export class InputError extends Error {
  constructor(
    message: string,
    readonly path: string,
    readonly status = 409,
  ) {
    super(message);
  }
}

/** A review move refused: 403 (role), 409 (not from the current state, named in `state`), 400/422 (content). */
export class ReviewMoveError extends Error {
  constructor(
    message: string,
    readonly status: 400 | 403 | 409 | 422,
    readonly state: string,
    readonly path = "form",
  ) {
    super(message);
  }
}
