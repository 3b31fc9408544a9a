/**
 * Errors and warnings of the engineering engine.
 *
 * Invalid input (a number that cannot describe a real frame) throws `EngineeringInputError`.
 * Expected "doesn't pass" or "unusual" outcomes are returned as `EngineeringWarning`s instead.
 */

/** One problem with one input field. `field` is a dotted path into the request, e.g. `levels.2.storyHeight`. */
export interface InputIssue {
  field: string
  message: string
}

/** A returned (not thrown) note that an input is outside its usual or qualified range. */
export type EngineeringWarning = InputIssue

/**
 * Thrown for invalid engineering input. It is a `RangeError`, so generic callers can catch
 * it as one, and it names the offending field so the API can answer HTTP 400 with
 * `fields: { [field]: message }`. `issues` lists every problem found (the first is `field`).
 */
export class EngineeringInputError extends RangeError {
  /** Dotted path of the first offending field, e.g. `levels.2.storyHeight`. */
  readonly field: string
  /** All problems found, first one first. */
  readonly issues: readonly InputIssue[]

  constructor(field: string, message: string, issues?: readonly InputIssue[]) {
    super(`${field}: ${message}`)
    this.name = 'EngineeringInputError'
    this.field = field
    this.issues = issues && issues.length > 0 ? issues : [{ field, message }]
  }

  /** Build the error from a non-empty list of issues (the first one becomes `field`). */
  static fromIssues(issues: readonly InputIssue[]): EngineeringInputError {
    const [first] = issues
    if (!first) throw new TypeError('EngineeringInputError.fromIssues needs at least one issue')
    return new EngineeringInputError(first.field, first.message, issues)
  }
}

/** True for a finite number (not NaN, not ±Infinity, not a string). */
export const isFiniteNumber = (value: unknown): value is number => typeof value === 'number' && Number.isFinite(value)

const describe = (value: unknown): string =>
  typeof value === 'number' ? String(value) : value === undefined ? 'nothing' : JSON.stringify(value) ?? String(value)

/**
 * Throw `EngineeringInputError` unless `value` is a finite number greater than zero.
 * `hint` tells the user what to enter, e.g. "the story height in ft".
 */
export function requirePositive(value: unknown, field: string, hint: string): number {
  if (!isFiniteNumber(value) || value <= 0) {
    throw new EngineeringInputError(field, `must be a finite number greater than 0 (got ${describe(value)}); enter ${hint}.`)
  }
  return value
}

/** Throw `EngineeringInputError` unless `value` is a finite number (any sign). */
export function requireFinite(value: unknown, field: string, hint: string): number {
  if (!isFiniteNumber(value)) {
    throw new EngineeringInputError(field, `must be a finite number (got ${describe(value)}); enter ${hint}.`)
  }
  return value
}

/** Message helper shared by validators: "must be … (got x); enter …". */
export function mustBe(requirement: string, value: unknown, hint: string): string {
  return `must be ${requirement} (got ${describe(value)}); enter ${hint}.`
}
