import type { FieldProblem } from '../validation/screening';

/**
 * Thrown by the engine when an input cannot be screened. `fields` lists every bad field by its
 * dotted path (`route.waypoints.3.lat`) with a message a flight planner understands; handlers map it
 * to HTTP 422 with the same `fields`.
 */
export class ScreeningInputError extends Error {
  readonly fields: FieldProblem[];

  constructor(fields: FieldProblem[], message?: string) {
    super(message ?? summarise(fields));
    this.name = 'ScreeningInputError';
    this.fields = fields;
  }
}

function summarise(fields: FieldProblem[]): string {
  if (fields.length === 0) return 'The screening input is not valid.';
  const first = fields[0];
  const where = first.path ? `${first.path}: ` : '';
  const more = fields.length > 1 ? ` (and ${fields.length - 1} more)` : '';
  return `${where}${first.message}${more}`;
}
