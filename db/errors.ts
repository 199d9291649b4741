/** A row was asked for by id and is not there. */
export class NotFoundError extends Error {
  constructor(readonly entity: string) {
    super(`${entity} not found`);
  }
}

/** A write was based on an older version of the row than the one stored. */
export class StaleWriteError extends Error {
  constructor(
    readonly entity: string,
    readonly currentVersion: number,
  ) {
    super(`${entity} was changed by someone else (now at version ${currentVersion})`);
  }
}

/** A unique value (an e-mail, a job number) is already taken. */
export class ConflictError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}
