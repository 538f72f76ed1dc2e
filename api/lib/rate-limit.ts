/**
 * Rate limits whose counters live in PostgreSQL (rate-limiter-flexible's PostgreSQL store on
 * knex's pool), so every app instance behind a proxy counts against the same budget.
 *
 * Two ways to count:
 * - exact: one upsert per request (sign-in, API tokens, uploads: rare, and worth a round trip);
 * - batched: the hot calculator routes count in memory and add their counts to the shared row
 *   every `flushMs`, learning the total from the same statement. A request therefore costs no
 *   database round trip; across instances the count can lag by one flush interval.
 *
 * When the database cannot be reached, counting falls back to this process's memory (the
 * store's insurance limiter) rather than refusing or failing requests.
 */
import type { Request, RequestHandler, Response } from 'express';
import type { Knex } from 'knex';
import { RateLimiterMemory, RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { TooManyRequestsError } from './errors';

export interface LimitRule {
  /** Short name, also the counter's key prefix and the policy name in the headers. */
  name: string;
  points: number;
  windowMs: number;
  /** The key a request is counted under (client address, user id). */
  keyOf: (req: Request) => string;
  /** Detail of the 429 answer. */
  message: string;
  /** Count in memory and write to PostgreSQL in batches (see above). */
  batched?: boolean;
}

const FLUSH_MS = 1000;
/** Keys seen this recently have their shared count re-read at each flush. */
const RECENT_MS = 10_000;

/** One per app: owns the PostgreSQL limiters and the batch timer. Kept on `app.locals.rateLimits`. */
export class RateLimitStore {
  private limiters = new Map<string, RateLimiterPostgres>();
  private batches = new Map<string, BatchedCounter>();

  constructor(
    private readonly knex: Knex,
    /** Prefix of every key, so separate deployments (or test apps) sharing one database do not share counters. */
    private readonly keyPrefix: string,
    private readonly flushMs = FLUSH_MS,
  ) {}

  limiter(rule: LimitRule): RateLimiterPostgres {
    const id = `${rule.name}:${rule.points}:${rule.windowMs}`;
    let rl = this.limiters.get(id);
    if (!rl) {
      rl = new RateLimiterPostgres({
        storeClient: this.knex,
        storeType: 'knex',
        tableName: 'rate_limits',
        tableCreated: true,
        keyPrefix: `${this.keyPrefix}:${rule.name}`,
        points: rule.points,
        duration: Math.ceil(rule.windowMs / 1000),
        insuranceLimiter: new RateLimiterMemory({
          keyPrefix: `${this.keyPrefix}:${rule.name}`,
          points: rule.points,
          duration: Math.ceil(rule.windowMs / 1000),
        }),
      });
      this.limiters.set(id, rl);
    }
    return rl;
  }

  batch(rule: LimitRule): BatchedCounter {
    const id = `${rule.name}:${rule.points}:${rule.windowMs}`;
    let b = this.batches.get(id);
    if (!b) {
      b = new BatchedCounter(this.limiter(rule), rule.points, this.flushMs);
      this.batches.set(id, b);
    }
    return b;
  }

  /** Write pending batched counts now (graceful shutdown, tests). */
  async flush(): Promise<void> {
    await Promise.all([...this.batches.values()].map((b) => b.flush()));
  }

  close(): void {
    for (const b of this.batches.values()) b.stop();
  }
}

interface KeyState {
  /** Counted here and not yet written. */
  pending: number;
  /** Being written right now. */
  inFlight: number;
  /** Total across instances as of the last write. */
  known: number;
  /** Epoch ms at which the shared window ends (0 = unknown). */
  resetAt: number;
  /** Epoch ms of the last request counted here. */
  lastSeen: number;
}

/** Counts in memory, adds to the shared PostgreSQL counter in batches. */
export class BatchedCounter {
  private keys = new Map<string, KeyState>();
  private timer: NodeJS.Timeout | null = null;

  constructor(
    private readonly rl: RateLimiterPostgres,
    private readonly points: number,
    private readonly flushMs: number,
  ) {}

  /** Count one request; `ok: false` when the key is over its budget. */
  take(key: string): { ok: boolean; remaining: number; resetMs: number } {
    const now = Date.now();
    let s = this.keys.get(key);
    if (!s) {
      s = { pending: 0, inFlight: 0, known: 0, resetAt: 0, lastSeen: now };
      this.keys.set(key, s);
    }
    if (s.resetAt !== 0 && now >= s.resetAt) {
      s.known = 0;
      s.resetAt = 0;
    }
    s.lastSeen = now;
    const used = s.known + s.inFlight + s.pending;
    const resetMs = s.resetAt ? s.resetAt - now : this.rl.duration * 1000;
    if (used >= this.points) return { ok: false, remaining: 0, resetMs };
    s.pending += 1;
    this.schedule();
    return { ok: true, remaining: this.points - used - 1, resetMs };
  }

  private schedule() {
    if (this.timer) return;
    this.timer = setTimeout(() => {
      this.timer = null;
      void this.flush();
    }, this.flushMs);
    this.timer.unref();
  }

  async flush(): Promise<void> {
    const writes: Promise<void>[] = [];
    for (const [key, s] of this.keys) {
      if (s.pending === 0) {
        if (s.inFlight === 0 && s.resetAt !== 0 && Date.now() >= s.resetAt) {
          this.keys.delete(key);
        } else if (s.inFlight === 0 && Date.now() - s.lastSeen < RECENT_MS) {
          // A client still calling here: learn what the other instances counted meanwhile.
          writes.push(
            this.rl.get(key).then(
              (res) => {
                if (res && s.inFlight === 0) {
                  s.known = res.consumedPoints;
                  s.resetAt = Date.now() + res.msBeforeNext;
                }
              },
              () => undefined,
            ),
          );
        }
        continue;
      }
      const n = s.pending;
      s.pending = 0;
      s.inFlight += n;
      writes.push(
        this.rl.penalty(key, n).then(
          (res: RateLimiterRes) => {
            s.inFlight -= n;
            s.known = res.consumedPoints;
            s.resetAt = Date.now() + res.msBeforeNext;
          },
          () => {
            // The database did not answer: keep the count and try again with the next batch.
            s.inFlight -= n;
            s.pending += n;
            this.schedule();
          },
        ),
      );
    }
    await Promise.all(writes);
    const now = Date.now();
    if ([...this.keys.values()].some((k) => k.pending > 0 || now - k.lastSeen < RECENT_MS)) this.schedule();
  }

  stop(): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
  }
}

function setHeaders(res: Response, rule: LimitRule, remaining: number, resetMs: number) {
  // draft-ietf-httpapi-ratelimit-headers-08, as express-rate-limit writes them.
  res.set('RateLimit-Policy', `"${rule.name}"; q=${rule.points}; w=${Math.ceil(rule.windowMs / 1000)}`);
  res.set('RateLimit', `"${rule.name}"; r=${Math.max(0, remaining)}; t=${Math.max(0, Math.ceil(resetMs / 1000))}`);
}

/** Express middleware enforcing `rule` with the app's store (`app.locals.rateLimits`). */
export function rateLimited(rule: LimitRule): RequestHandler {
  return (req, res, next) => {
    const store = req.app.locals.rateLimits as RateLimitStore | undefined;
    if (!store) return next();
    const key = rule.keyOf(req);
    if (rule.batched) {
      const taken = store.batch(rule).take(key);
      setHeaders(res, rule, taken.remaining, taken.resetMs);
      if (!taken.ok) {
        res.set('Retry-After', String(Math.max(1, Math.ceil(taken.resetMs / 1000))));
        return next(new TooManyRequestsError(rule.message));
      }
      return next();
    }
    store
      .limiter(rule)
      .consume(key)
      .then(
        (r) => {
          setHeaders(res, rule, r.remainingPoints, r.msBeforeNext);
          next();
        },
        (r: unknown) => {
          if (r instanceof RateLimiterRes) {
            setHeaders(res, rule, 0, r.msBeforeNext);
            res.set('Retry-After', String(Math.max(1, Math.ceil(r.msBeforeNext / 1000))));
            return next(new TooManyRequestsError(rule.message));
          }
          // Neither the store nor its insurance could count: let the request through rather than fail it.
          req.log?.warn({ err: r }, 'rate limit could not be counted');
          next();
        },
      );
  };
}
