import { EngineInputError } from '../hydraulics/errors';

/** One problem on one line of an uploaded file (line numbers count from 1, as an editor shows them). */
export interface LineIssue {
  line: number;
  message: string;
}

/** Issues collected before a parse gives up, so a bad file reports several lines at once. */
export const MAX_LINE_ISSUES = 20;

/**
 * A file (or a set of typed readings) that cannot become a record. `field` names the input
 * ('file', 'barometric', 'readings'); `issues` lists the offending lines, first ones first.
 */
export class RecordFileError extends EngineInputError {
  readonly issues: readonly LineIssue[];
  readonly truncated: boolean;

  constructor(field: string, problem: string, issues: readonly LineIssue[] = [], truncated = false) {
    super(field, problem);
    this.name = 'RecordFileError';
    this.issues = issues;
    this.truncated = truncated;
  }

  static fromIssues(field: string, what: string, issues: readonly LineIssue[], truncated: boolean): RecordFileError {
    const count = truncated ? `at least ${issues.length}` : String(issues.length);
    const listed = issues.slice(0, 3).map((i) => `line ${i.line}: ${i.message}`).join('; ');
    const more = issues.length > 3 ? `; and ${truncated ? 'more' : `${issues.length - 3} more`}` : '';
    const problem =
      issues.length === 1 ? `line ${issues[0].line}: ${issues[0].message}` : `${what} has ${count} problems — ${listed}${more}`;
    return new RecordFileError(field, problem, issues, truncated);
  }
}
