/**
 * The one error type the numerical core throws for bad input. `field` names the
 * offending input (e.g. `ratio`, `model.sensitivity`, `prior.correlation`) so a form
 * can attach the message to the right control.
 *
 * @example new DesignInputError('ratio', 'a number strictly between 0 and 1', 1.2).field // 'ratio'
 */
export class DesignInputError extends Error {
  readonly field: string;
  readonly allowed: string;

  constructor(field: string, allowed: string, received: unknown) {
    super(`${field} must be ${allowed} (received ${describe(received)})`);
    this.name = 'DesignInputError';
    this.field = field;
    this.allowed = allowed;
  }
}

function describe(value: unknown): string {
  if (typeof value === 'number') return String(value);
  if (value === undefined) return 'nothing';
  if (value === null) return 'null';
  if (typeof value === 'string') return JSON.stringify(value);
  return typeof value;
}
