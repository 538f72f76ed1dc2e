/**
 * Answers built from a campaign's stored runs (its analysis, its list of runs), serialised once per
 * state of the runs and kept in a bounded in-process cache.
 *
 * Every part of a cache key is read from PostgreSQL on each request (the campaign, the runs' stamp),
 * so several instances never serve a stale entry; an entry is only ever replaced, never invalidated.
 * Runs do not bump their campaign's version, hence the stamp: any run added, removed or changed
 * (every change bumps the run's own version) changes it.
 */
import type { Knex } from 'knex';
import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';
import { brotliOnce } from '../../lib/compress';

/** An answer serialised once: the JSON body and its entity tag. */
export interface SerialisedBody {
  etag: string;
  body: string;
  /** The body compressed with brotli, made on the first request that accepts it (about a sixth of the body, not counted in the cache's size). */
  brotli?: Promise<Buffer>;
}

/** The entry's body compressed with brotli, compressed once per cached entry and then reused. */
export function brotliBody(entry: SerialisedBody): Promise<Buffer> {
  entry.brotli ??= brotliOnce(entry.body).catch((err: unknown) => {
    entry.brotli = undefined;
    throw err;
  });
  return entry.brotli;
}

/** A cache of serialised answers bounded by their total body size. */
export const serialisedCache = (maxBytes: number) =>
  new LRUCache<string, SerialisedBody>({ maxSize: maxBytes, sizeCalculation: (v) => v.body.length + 64, max: 500 });

/** The state of a campaign's runs: how many there are and a digest of every run's id and version. */
export async function runsStamp(db: Knex, campaignId: string): Promise<{ n: number; digest: string }> {
  const row = await db('measurements')
    .where({ campaignId })
    .first<{ n: number; digest: string | null } | undefined>(
      db.raw('count(*)::int as n'),
      db.raw("md5(string_agg(id::text || ':' || version::text, ',' order by id)) as digest"),
    );
  return { n: row?.n ?? 0, digest: row?.digest ?? '' };
}

/** A weak entity tag for a cache key: `kind` tells answers of different routes apart. */
export const entityTag = (kind: string, key: string) => `W/"${kind}-${createHash('sha256').update(key).digest('base64url').slice(0, 27)}"`;
