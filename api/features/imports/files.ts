/**
 * Uploaded files kept as the record they are: the bytes as they arrived, with name, size,
 * SHA-256, uploader and time, and the rows each produced. Members read the list and download
 * the original; nothing here changes a file once stored.
 */
import type { Knex } from 'knex';
import { NotFoundError } from '../../lib/errors';
import { isUuid } from '../campaigns/service';

export interface ImportFileView {
  id: string;
  fileName: string;
  mediaType: string;
  format: string;
  sizeBytes: number;
  sha256: string;
  rowCount: number;
  /** Rows of this file still stored in the campaign (runs deleted since are not counted). */
  storedRowCount: number;
  uploadedAt: string;
  uploadedBy: string;
}

const fileNotFound = () => new NotFoundError('No uploaded file was found at this address in this project.');

/** The project a kept file belongs to, or null (unknown id, or not a uuid). */
export async function resolveImportFileProjectId(db: Knex, fileId: unknown): Promise<string | null> {
  if (!isUuid(fileId)) return null;
  const row = await db('importFiles as f').join('campaigns as c', 'c.id', 'f.campaignId').where('f.id', fileId).first('c.projectId');
  return row?.projectId ?? null;
}

/** A campaign's kept files, newest first (without their bytes). */
export async function listImportFiles(db: Knex, campaignId: string): Promise<ImportFileView[]> {
  const rows: (Omit<ImportFileView, 'storedRowCount' | 'uploadedAt' | 'uploadedBy'> & {
    uploadedAt: Date;
    login: string | null;
    displayName: string | null;
    stored: number;
  })[] = await db('importFiles as f')
    .leftJoin('users as u', 'u.id', 'f.uploadedByUserId')
    .where('f.campaignId', campaignId)
    .orderBy('f.uploadedAt', 'desc')
    .orderBy('f.id')
    .select(
      'f.id',
      'f.fileName',
      'f.mediaType',
      'f.format',
      'f.sizeBytes',
      'f.sha256',
      'f.rowCount',
      'f.uploadedAt',
      'u.login',
      'u.displayName',
      db.raw('(select count(*)::int from measurements m where m.import_file_id = f.id) as stored'),
    );
  return rows.map((r) => ({
    id: r.id,
    fileName: r.fileName,
    mediaType: r.mediaType,
    format: r.format,
    sizeBytes: r.sizeBytes,
    sha256: r.sha256,
    rowCount: r.rowCount,
    storedRowCount: r.stored,
    uploadedAt: new Date(r.uploadedAt).toISOString(),
    uploadedBy: r.login ? (r.displayName ?? r.login) : 'a removed account',
  }));
}

/** One kept file with its bytes, or NotFoundError. */
export async function readImportFile(
  db: Knex,
  projectId: string,
  fileId: string,
): Promise<{ fileName: string; mediaType: string; sha256: string; content: Buffer }> {
  if (!isUuid(fileId)) throw fileNotFound();
  const row = await db('importFiles as f')
    .join('campaigns as c', 'c.id', 'f.campaignId')
    .where({ 'f.id': fileId, 'c.projectId': projectId })
    .first('f.fileName', 'f.mediaType', 'f.sha256', 'f.content');
  if (!row) throw fileNotFound();
  return row;
}

/** Header names the column guesser recognises, one example screen below them (invented numbers). */
export function importTemplateCsv(measure: string): string {
  const selectivityHeader = measure === 'ee' ? 'ee (%)' : measure === 'percentA' ? 'A (%)' : measure;
  const example = (t: number, ee: number, er: string, rep: string, sample: string) =>
    [sample, rep, t, measure === 'ee' ? ee : measure === 'percentA' ? Math.round((50 + ee / 2) * 10) / 10 : er, '', '', ''].join(',');
  const lines = [
    ['Sample ID', 'Replicate', 'Temperature (°C)', selectivityHeader, 'Conversion (%)', 'Time (h)', 'Notes'].join(','),
    example(-40, 96.2, '51.6:1', 'a', 'EX-01'),
    example(-40, 96.0, '49:1', 'b', 'EX-02'),
    example(-20, 93.1, '28:1', 'a', 'EX-03'),
    example(0, 88.4, '16.2:1', 'a', 'EX-04'),
    example(20, 81.9, '10:1', 'a', 'EX-05'),
  ];
  return `${lines.join('\r\n')}\r\n`;
}
