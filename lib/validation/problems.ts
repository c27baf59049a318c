/** The two shapes every problem with input takes; client-safe, shared by forms, handlers and the engine. */

/** One problem with one input field: `path` is dotted (`route.waypoints.3.lat`). */
export interface FieldProblem {
  path: string;
  message: string;
}

/**
 * One problem with one place in an uploaded file: `line` (the header is line 1; 0 is the file as a
 * whole), `column` (a header name, or '' for the whole line) and what to fix.
 */
export interface LineProblem {
  line: number;
  column: string;
  message: string;
}
