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
