import { AppError, type FieldError } from '../../lib/errors';

/** The multipart field the file arrives in (`UPLOAD_FIELD`; not imported here, so the reading worker stays small). */
const FILE_FIELD = 'file';

/** One problem found in an uploaded file. `row` is the row number a spreadsheet program shows. */
export interface ImportIssue {
  severity: 'error' | 'warning';
  /** 1-based row of the file (blank lines count, as in a spreadsheet); null for the whole file or a column. */
  row: number | null;
  /** Column letter and header, e.g. `B "ee (%)"`; null when the issue is about a whole row or the file. */
  column: string | null;
  message: string;
}

/**
 * An issue as a field error: the path is the request's file field (a path into the request, like every
 * errors[] entry); where in the file it is stays in the message and, structured, in the problem's `issues`.
 */
export function issueToFieldError(issue: ImportIssue): FieldError {
  const where = [issue.row !== null ? `row ${issue.row}` : null, issue.column !== null ? `column ${issue.column}` : null]
    .filter(Boolean)
    .join(', ');
  return { path: FILE_FIELD, message: where ? `${where}: ${issue.message}` : issue.message };
}

/** The file itself cannot be read: empty, not a spreadsheet, broken quoting, no worksheet... */
export class UnreadableFileError extends AppError {
  constructor(detail: string) {
    super('unreadable-file', detail, [{ path: FILE_FIELD, message: detail }]);
  }
}

/** Rows of the file failed validation; nothing was imported. */
export class ImportRejectedError extends AppError {
  constructor(detail: string, issues: ImportIssue[]) {
    super('import-rejected', detail, issues.filter((i) => i.severity === 'error').map(issueToFieldError), { issues });
  }
}

/** The file is valid but has warnings the user has not confirmed; nothing was imported. */
export class ImportNeedsConfirmationError extends AppError {
  constructor(detail: string, issues: ImportIssue[]) {
    super('warnings-need-confirmation', detail, issues.map(issueToFieldError), { issues, acknowledgeWarnings: false });
  }
}
