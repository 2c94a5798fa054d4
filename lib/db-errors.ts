/** mysql2 error fields we translate into field errors. */
type DbError = { code?: string; errno?: number; sqlMessage?: string };

export function isDbError(error: unknown): error is DbError {
  return typeof error === "object" && error !== null && "code" in error;
}

/**
 * Names the unique index a duplicate hit, relying on the `<table>_<column>_unique`
 * index-name convention of the migrations.
 */
export function duplicateIndex(error: unknown): string | undefined {
  if (!isDbError(error) || error.code !== "ER_DUP_ENTRY") return undefined;
  return /for key '(?:[^.']+\.)?([^']+)'/.exec(error.sqlMessage ?? "")?.[1];
}

/** A writer waited too long for another's lock: same meaning as a lost race. */
export function isLockWaitTimeout(error: unknown): boolean {
  return isDbError(error) && error.code === "ER_LOCK_WAIT_TIMEOUT";
}
