/**
 * What the campaign-area routers share: the version a write names (body, `?version=` or If-Match),
 * the acting member, the ETag of a version, a file name safe in a download and the download itself,
 * and an answer serialised once (with its tag and its brotli copy).
 */
import type { Request, Response } from 'express';
import { z } from 'zod';
import { BadRequestError } from '../../lib/errors';
import { parseBody } from '../../lib/validation';
import { COMPRESS_FROM_BYTES } from '../../lib/compress';
import type { ProjectActor } from './service';
import { brotliBody, type SerialisedBody } from './serialised';

export const versionQuerySchema = z.object({
  version: z.coerce
    .number({ error: 'version must be a number' })
    .int('version must be an integer')
    .min(1, 'version must be at least 1')
    .optional(),
});

/** A file name safe in Content-Disposition and on any disk: letters, digits, dot, dash, underscore. */
export const safeFileName = (name: string) =>
  name
    .replace(/[^\p{L}\p{N}._-]+/gu, '-')
    .replace(/^[.-]+/, '')
    .slice(0, 120) || 'file';

/** The media types of the files the campaign area hands out. */
const DOWNLOAD_TYPES = {
  csv: 'text/csv; charset=utf-8',
  pdf: 'application/pdf',
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
} as const;

/** Sends a file to save (never cached, since it may hold project data): 200, its type, its name and its body. */
export function sendDownload(res: Response, type: keyof typeof DOWNLOAD_TYPES, fileName: string, body: string | Buffer) {
  res.status(200).type(DOWNLOAD_TYPES[type]).attachment(fileName).set('Cache-Control', 'no-store').send(body);
}

/**
 * Sends an answer serialised once (serialised.ts), or 304 when the caller sends its tag back. The body
 * carries nothing about the caller, so the tag need not either; authorization runs before this, so a
 * caller who may not read the campaign never learns a tag. Browsers keep no copy (private, no-store):
 * scripts send If-None-Match themselves. A large body goes to a client that accepts brotli as the
 * copy compressed once with the entry (the compression middleware leaves an encoded answer alone).
 */
export async function sendSerialised(req: Request, res: Response, entry: SerialisedBody): Promise<void> {
  res.set({ ETag: entry.etag, 'Cache-Control': 'private, no-store', Vary: 'Cookie, Authorization, Accept-Encoding' });
  if (req.fresh) return void res.status(304).end();
  res.type('application/json');
  if (entry.body.length >= COMPRESS_FROM_BYTES && req.acceptsEncodings('br', 'identity') === 'br') {
    res.set('Content-Encoding', 'br');
    return void res.send(await brotliBody(entry));
  }
  res.send(entry.body);
}

const IF_MATCH = /^\s*(?:W\/)?"(\d+)"\s*$/;

/** The version named by `If-Match: W/"<n>"`, or undefined when the header is absent. */
function ifMatchVersion(req: Request): number | undefined {
  const header = req.get('If-Match');
  if (header === undefined) return undefined;
  const m = IF_MATCH.exec(header);
  if (!m)
    throw new BadRequestError('If-Match must name one version, e.g. W/"3".', [{ path: 'If-Match', message: 'expected W/"<version>"' }]);
  return Number(m[1]);
}

/** The body with `version` taken from If-Match when the body has none; both given must agree. */
export function withVersion(req: Request): unknown {
  const body: unknown = req.body ?? {};
  const header = ifMatchVersion(req);
  if (header === undefined || body === null || typeof body !== 'object' || Array.isArray(body)) return body;
  const sent = (body as { version?: unknown }).version;
  if (sent === undefined) return { ...body, version: header };
  if (sent !== header)
    throw new BadRequestError(`If-Match names version ${header} but the body names version ${String(sent)}; send one.`, [
      { path: 'version', message: 'disagrees with If-Match' },
    ]);
  return body;
}

/** Version of a delete: `?version=N` or If-Match. */
export function deleteVersion(req: Request, schema: z.ZodType<{ version?: number }> = versionQuerySchema): number {
  const { version } = parseBody(schema, req.query);
  const header = ifMatchVersion(req);
  if (version !== undefined && header !== undefined && version !== header) {
    throw new BadRequestError(`If-Match names version ${header} but the query names version ${version}; send one.`, [
      { path: 'version', message: 'disagrees with If-Match' },
    ]);
  }
  const v = version ?? header;
  if (v === undefined)
    throw new BadRequestError('Name the version you last read: ?version=N or If-Match: W/"N".', [
      { path: 'version', message: 'version is required' },
    ]);
  return v;
}

export const actorOf = (req: Request): ProjectActor => ({ projectId: req.project!.id, actorUserId: req.user!.id });
export const etag = (version: number) => `W/"${version}"`;
