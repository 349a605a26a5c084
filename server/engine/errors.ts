/**
 * Typed errors and warnings of the pure engine. The engine never imports Express or Sequelize;
 * the API layer maps an EngineError to HTTP 422 (the model cannot be applied) or 400 (bad input).
 */
export type EngineErrorKind = 'out-of-range' | 'invalid-input';

export class EngineError extends Error {
  readonly kind: EngineErrorKind;
  readonly code: string;
  /** Dotted path of the offending input field, e.g. `voltageV` or `device.max[3]`. */
  readonly field?: string;

  constructor(kind: EngineErrorKind, code: string, message: string, field?: string) {
    super(message);
    this.name = 'EngineError';
    this.kind = kind;
    this.code = code;
    this.field = field;
  }
}

/** A warning attached to a result: never silent, always shown next to the number it qualifies. */
export interface EngineWarning {
  code: string;
  message: string;
}
