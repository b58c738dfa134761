/**
 * Thrown when an input to a calculation is outside what the method accepts. The message says
 * what is wrong and what to do; `field` names the offending input where there is one.
 */
export class CalcInputError extends Error {
  override readonly name = 'CalcInputError';
  constructor(
    message: string,
    readonly field?: string,
  ) {
    super(message);
  }
}
