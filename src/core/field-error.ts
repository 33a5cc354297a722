/** One problem with one input field, in words a nurse can act on; min and max give the allowed range where there is one. */
export interface FieldError {
  field: string;
  message: string;
  min?: number;
  max?: number;
}

/** Thrown deep when input is refused; converted to a 400 answer, an exit code or an inline message at the edge. */
export class ValidationError extends Error {
  readonly errors: FieldError[];
  constructor(errors: FieldError[]) {
    super(errors.map((e) => e.message).join('; '));
    this.name = 'ValidationError';
    this.errors = errors;
  }
}
