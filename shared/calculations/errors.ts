/**
 * Thrown by the computation when its input is malformed (a bad date, a negative
 * rate, an unknown unit). `field` names the offending input so the server can
 * answer 400 with field errors and the form can mark the field.
 */
export class CalculationInputError extends Error {
  readonly field: string;

  constructor(field: string, message: string) {
    super(message);
    this.name = 'CalculationInputError';
    this.field = field;
  }
}

export function isCalculationInputError(e: unknown): e is CalculationInputError {
  return e instanceof CalculationInputError;
}
