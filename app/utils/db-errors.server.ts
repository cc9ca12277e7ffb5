// Database refusals that are the caller's doing, turned into field errors in one place: a
// unique key hit by two concurrent creates of the same name (409), a reference to a row
// that went away meanwhile (409), a value the column cannot hold (422). Never a 500.
import { DatabaseError, ForeignKeyConstraintError, UniqueConstraintError } from "sequelize";
import { InputError } from "../services/errors.server";

/** Unique indexes (db/migrations) → the request field they guard. */
function fieldOfUniqueKey(key: string): string {
  if (/email/i.test(key)) return "email";
  if (/name/i.test(key)) return "name";
  return "(body)";
}

// MariaDB error numbers of values a column cannot hold.
const VALUE_ERRORS = new Set([
  1264, // ER_WARN_DATA_OUT_OF_RANGE
  1292, // ER_TRUNCATED_WRONG_VALUE (e.g. a datetime out of range)
  1366, // ER_TRUNCATED_WRONG_VALUE_FOR_FIELD (text the column's character set cannot hold)
  1406, // ER_DATA_TOO_LONG
  4025, // ER_CONSTRAINT_FAILED (the JSON check)
]);

/** The InputError a database error stands for, or null when it is not the input's fault. */
export function databaseInputError(error: unknown): InputError | null {
  if (error instanceof UniqueConstraintError) {
    const path = fieldOfUniqueKey(Object.keys(error.fields ?? {}).join(" "));
    const what = path === "(body)" ? "record" : path;
    return new InputError(`Another record already has this ${what}; it may have been created a moment ago. Choose another ${what}.`, path, 409);
  }
  if (error instanceof ForeignKeyConstraintError) {
    return new InputError("The record refers to one that no longer exists, or is still referred to by others.", "(body)", 409);
  }
  if (error instanceof DatabaseError) {
    const errno = (error.parent as { errno?: number } | undefined)?.errno;
    if (errno !== undefined && VALUE_ERRORS.has(errno)) return new InputError("A value is outside what can be stored; check lengths, dates and text.", "(body)", 422);
  }
  return null;
}
