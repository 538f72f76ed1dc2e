/**
 * A project's or a campaign's history written as sentences a chemist reads: who, when, what
 * changed from what to what, and why. Built from the audit trail (`audit_events`), which keeps
 * snapshots; nothing here shows ids, field names or JSON.
 */
import type { Knex } from 'knex';
import { auditRowsPage } from './service';

export interface HistoryEntry {
  /** Cursor for paging (`before`); not for display. */
  id: number;
  at: string;
  who: string;
  /** The whole change in one sentence, reason included. */
  sentence: string;
  reason: string | null;
}

export interface HistoryPage {
  entries: HistoryEntry[];
  nextBefore: number | null;
}

type Snapshot = Record<string, unknown>;

interface EventRow {
  id: number;
  createdAt: Date;
  action: 'create' | 'update' | 'delete';
  entityType: string;
  entityId: string;
  before: Snapshot | null;
  after: Snapshot | null;
  reason: string | null;
  campaignId: string | null;
  actorUserId: string | null;
  login: string | null;
  displayName: string | null;
}

interface Names {
  people: Map<string, string>;
  campaigns: Map<string, string>;
}

const REMOVED_ACCOUNT = 'A removed account';

// ── Numbers and quantities ─────────────────────────────────────────────────────────────────

/** A stored number as people write it: no float artefacts, a true minus sign. */
export function formatNumber(v: number): string {
  const text = String(Number(v.toPrecision(10)));
  return text.startsWith('-') ? `−${text.slice(1)}` : text;
}

/** Kelvin → "−20 °C" (to 0.1 °C, the precision a jacket is set to). */
export function formatCelsius(kelvin: number): string {
  return `${formatNumber(Math.round((kelvin - 273.15) * 10) / 10)} °C`;
}

function formatDuration(seconds: number): string {
  if (seconds >= 3600) return `${formatNumber(Math.round((seconds / 3600) * 100) / 100)} h`;
  if (seconds >= 60) return `${formatNumber(Math.round((seconds / 60) * 10) / 10)} min`;
  return `${formatNumber(seconds)} s`;
}

const MEASURE_WORD: Record<string, string> = { ee: 'ee', er: 'er', dr: 'dr', percentA: 'share of A', ratio: 'ratio' };
const PERCENT_MEASURES = new Set(['ee', 'percentA']);

interface Reading {
  measure: string;
  value: number;
  valueB: number | null;
  isLowerBound: boolean;
}

const readingOf = (s: Snapshot): Reading => ({
  measure: String(s.measure),
  value: Number(s.value),
  valueB: s.valueB === null || s.valueB === undefined ? null : Number(s.valueB),
  isLowerBound: s.isLowerBound === true,
});

/** "98.7" for ee, "95:5" for a pair, "12:1" for a single ratio; "≥ " in front of a bound. */
function readingNumber(r: Reading): string {
  const bound = r.isLowerBound ? '≥ ' : '';
  if (r.valueB !== null) return `${bound}${formatNumber(r.value)}:${formatNumber(r.valueB)}`;
  if (PERCENT_MEASURES.has(r.measure)) return `${bound}${formatNumber(r.value)}`;
  return `${bound}${formatNumber(r.value)}:1`;
}

const unitOf = (measure: string) => (PERCENT_MEASURES.has(measure) ? ' %' : '');

/** "ee 98.7 %". */
export function formatReading(r: Reading): string {
  return `${MEASURE_WORD[r.measure] ?? r.measure} ${readingNumber(r)}${unitOf(r.measure)}`;
}

/** "ee 98.7 → 98.9 %", or both readings in full when the measure changed. */
function readingChange(a: Reading, b: Reading): string {
  if (a.measure === b.measure)
    return `${MEASURE_WORD[a.measure] ?? a.measure} ${readingNumber(a)} → ${readingNumber(b)}${unitOf(a.measure)}`;
  return `${formatReading(a)} → ${formatReading(b)}`;
}

const quote = (text: unknown, max = 80) => {
  const s = String(text ?? '')
    .replace(/\s+/g, ' ')
    .trim();
  return `“${s.length > max ? `${s.slice(0, max - 1)}…` : s}”`;
};

const plural = (n: number, one: string, many = `${one}s`) => `${formatNumber(n)} ${n === 1 ? one : many}`;

// ── Runs ───────────────────────────────────────────────────────────────────────────────────

/** "run KL-12 a at −20 °C", or "the run at −20 °C" when it has no sample id or replicate. */
export function runLabel(s: Snapshot): string {
  const name = [s.sampleId, s.replicateLabel].filter((x) => typeof x === 'string' && x.trim() !== '').join(' ');
  const at = typeof s.temperatureK === 'number' ? ` at ${formatCelsius(s.temperatureK)}` : '';
  return name ? `run ${name}${at}` : `the run${at}`;
}

const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);
const orNone = (v: unknown, show: (x: never) => string) => (v === null || v === undefined || v === '' ? 'none' : show(v as never));

/** What changed in a measurement, field by field, as "temperature −20 → −25 °C". */
function measurementChanges(b: Snapshot, a: Snapshot): string[] {
  const out: string[] = [];
  if (!same(b.temperatureK, a.temperatureK)) {
    out.push(
      `temperature ${formatNumber(Math.round((Number(b.temperatureK) - 273.15) * 10) / 10)} → ${formatCelsius(Number(a.temperatureK))}`,
    );
  }
  if (!same(b.measure, a.measure) || !same(b.value, a.value) || !same(b.valueB, a.valueB) || !same(b.isLowerBound, a.isLowerBound)) {
    out.push(readingChange(readingOf(b), readingOf(a)));
  }
  const plain: [string, string, (x: never) => string][] = [
    ['uncertainty', 'uncertainty', (x: number) => `± ${formatNumber(x)}`],
    ['sampleId', 'sample id', (x: string) => x],
    ['replicateLabel', 'replicate', (x: string) => x],
    ['conversionPercent', 'conversion', (x: number) => `${formatNumber(x)} %`],
    ['reactionTimeS', 'reaction time', (x: number) => formatDuration(x)],
    ['notes', 'notes', (x: string) => quote(x)],
  ];
  for (const [key, word, show] of plain) {
    if (!same(b[key], a[key])) out.push(`${word} ${orNone(b[key], show)} → ${orNone(a[key], show)}`);
  }
  return out;
}

// ── Campaigns and projects ─────────────────────────────────────────────────────────────────

const ASSAY_WORD: Record<string, string> = {
  'chiral-hplc': 'chiral HPLC',
  'chiral-sfc': 'chiral SFC',
  'chiral-gc': 'chiral GC',
  nmr: 'NMR',
  other: 'another method',
};

const CAMPAIGN_FIELDS: [string, string, (x: never) => string][] = [
  ['title', 'title', (x: string) => quote(x)],
  ['reactionDescription', 'reaction', (x: string) => quote(x)],
  ['productNameA', 'product A', (x: string) => quote(x)],
  ['productNameB', 'product B', (x: string) => quote(x)],
  ['measure', 'reported as', (x: string) => MEASURE_WORD[x] ?? x],
  ['assayMethod', 'assay', (x: string) => ASSAY_WORD[x] ?? x],
  ['defaultUncertainty', 'default uncertainty', (x: number) => `± ${formatNumber(x)}`],
  ['status', 'status', (x: string) => x],
  ['notes', 'notes', (x: string) => quote(x)],
];

function fieldChanges(fields: [string, string, (x: never) => string][], b: Snapshot, a: Snapshot): string[] {
  return fields
    .filter(([key]) => !same(b[key], a[key]))
    .map(([key, word, show]) => `${word} ${orNone(b[key], show)} → ${orNone(a[key], show)}`);
}

const ROLE_WORD: Record<string, string> = { owner: 'owner', editor: 'editor', viewer: 'viewer' };
const day = (iso: unknown) => (typeof iso === 'string' ? iso.slice(0, 10) : 'an earlier date');

// ── Sentences ──────────────────────────────────────────────────────────────────────────────

/** The sentence for one event, without the reason (added by the caller). */
function describe(e: EventRow, who: string, names: Names, withCampaign: boolean): string {
  const b = e.before ?? {};
  const a = e.after ?? {};
  const campaignTitle =
    (e.campaignId && names.campaigns.get(e.campaignId)) ??
    (typeof a.campaignTitle === 'string' ? a.campaignTitle : typeof b.title === 'string' ? b.title : null);
  const inCampaign = withCampaign && campaignTitle ? ` in ${quote(campaignTitle)}` : '';
  const toCampaign = withCampaign && campaignTitle ? ` to ${quote(campaignTitle)}` : '';
  const person = (id: string) => names.people.get(id) ?? REMOVED_ACCOUNT.toLowerCase();

  switch (e.entityType) {
    case 'measurement': {
      if (e.action === 'create') return `${who} added ${runLabel(a)}${toCampaign}: ${formatReading(readingOf(a))}`;
      if (e.action === 'delete') return `${who} deleted ${runLabel(b)}${inCampaign} (${formatReading(readingOf(b))})`;
      if (b.excluded !== a.excluded) {
        return a.excluded
          ? `${who} excluded ${runLabel(b)}${inCampaign} from the fit`
          : `${who} brought ${runLabel(b)}${inCampaign} back into the fit`;
      }
      const changes = measurementChanges(b, a);
      return changes.length
        ? `${who} changed ${runLabel(b)}${inCampaign}: ${changes.join(', ')}`
        : `${who} saved ${runLabel(b)}${inCampaign} without changes`;
    }
    case 'measurement_batch':
      return `${who} added ${plural(Number(a.rows ?? 0), 'run')}${toCampaign} by typing or pasting`;
    case 'measurement_import': {
      const range = a.temperatureRangeK as { min?: number; max?: number } | undefined;
      const span =
        range && typeof range.min === 'number' && typeof range.max === 'number'
          ? range.min === range.max
            ? `, at ${formatCelsius(range.min)}`
            : `, ${formatNumber(Math.round((range.min - 273.15) * 10) / 10)} to ${formatCelsius(range.max)}`
          : '';
      const temps = typeof a.distinctTemperatures === 'number' ? ` at ${plural(a.distinctTemperatures, 'temperature')}` : '';
      const warned = Number(a.acknowledgedWarnings ?? 0) > 0 ? `; ${plural(Number(a.acknowledgedWarnings), 'warning')} confirmed` : '';
      return `${who} imported ${plural(Number(a.rows ?? 0), 'run')} from ${quote(a.fileName)}${withCampaign && campaignTitle ? ` into ${quote(campaignTitle)}` : ''} (${`${temps}${span}`.replace(/^[ ,]+/, '')}${warned})`;
    }
    case 'campaign': {
      const title = quote(a.title ?? b.title ?? campaignTitle);
      if (e.action === 'create') {
        const n = typeof a.measurementCount === 'number' ? ` with ${plural(a.measurementCount, 'measurement')}` : '';
        return `${who} created campaign ${title}${n}`;
      }
      if (e.action === 'delete') {
        return `${who} deleted campaign ${title} with its ${plural(Number(b.measurementCount ?? 0), 'measurement')} and ${plural(Number(b.savedForecastCount ?? 0), 'saved forecast')}`;
      }
      const changes = fieldChanges(CAMPAIGN_FIELDS, b, a);
      return changes.length
        ? `${who} changed campaign ${quote(b.title)}: ${changes.join('; ')}`
        : `${who} saved campaign ${title} without changes`;
    }
    case 'campaign_sign_off': {
      const title = quote(a.title ?? b.title ?? campaignTitle);
      if (a.signedOff === true) {
        const n =
          typeof a.measurementCount === 'number' ? ` (${plural(a.measurementCount, 'measurement')} locked)` : ' (measurements locked)';
        return `${who} signed off campaign ${title}${n}`;
      }
      const by = typeof b.signedOffBy === 'string' ? ` (signed off by ${b.signedOffBy} on ${day(b.signedOffAt)})` : '';
      return `${who} reopened campaign ${title}${by}`;
    }
    case 'saved_forecast': {
      const s = e.action === 'delete' ? b : a;
      const label = typeof s.label === 'string' && s.label.trim() ? ` ${quote(s.label)}` : '';
      const at = typeof s.temperatureK === 'number' ? ` at ${formatCelsius(s.temperatureK)}` : '';
      return e.action === 'delete'
        ? `${who} deleted the saved forecast${label}${at}${inCampaign}`
        : `${who} saved a forecast${label}${at}${inCampaign}`;
    }
    case 'project': {
      if (e.action === 'create') return `${who} created the project ${quote(a.name)}`;
      if (e.action === 'delete') return `${who} deleted the project ${quote(b.name)}`;
      const changes = fieldChanges(
        [
          ['name', 'name', (x: string) => quote(x)],
          ['description', 'description', (x: string) => quote(x)],
        ],
        b,
        a,
      );
      return changes.length ? `${who} changed the project: ${changes.join('; ')}` : `${who} saved the project without changes`;
    }
    case 'project_member': {
      const self = e.actorUserId !== null && e.actorUserId === e.entityId;
      const them = person(e.entityId);
      if (e.action === 'create')
        return self
          ? `${who} joined the project as ${ROLE_WORD[String(a.role)] ?? a.role}`
          : `${who} added ${them} to the project as ${ROLE_WORD[String(a.role)] ?? a.role}`;
      if (e.action === 'delete')
        return self ? `${who} left the project` : `${who} removed ${them} (${ROLE_WORD[String(b.role)] ?? b.role}) from the project`;
      return `${who} changed the role of ${them}: ${ROLE_WORD[String(b.role)] ?? b.role} → ${ROLE_WORD[String(a.role)] ?? a.role}`;
    }
    case 'invitation': {
      const email = String(a.email ?? b.email ?? 'someone');
      if (e.action === 'create') return `${who} invited ${email} as ${ROLE_WORD[String(a.role)] ?? a.role}`;
      if (a.revokedAt && !b.revokedAt) return `${who} withdrew the invitation sent to ${email}`;
      if (a.acceptedAt && !b.acceptedAt) return `${who} accepted the invitation sent to ${email}`;
      return `${who} changed the invitation sent to ${email}`;
    }
    default:
      return `${who} made a change that this page cannot describe (${e.entityType.replace(/_/g, ' ')})`;
  }
}

/** The sentence with its reason, as shown and exported. */
function sentenceOf(e: EventRow, names: Names, withCampaign: boolean): HistoryEntry {
  const who = e.actorUserId && e.login ? (e.displayName ?? e.login) : REMOVED_ACCOUNT;
  const text = describe(e, who, names, withCampaign);
  const reason = e.reason?.trim() ? e.reason.trim() : null;
  const reasonWord = e.entityType === 'campaign_sign_off' && e.after?.signedOff === true ? 'note' : 'reason';
  return {
    id: e.id,
    at: new Date(e.createdAt).toISOString(),
    who,
    sentence: `${text}${reason ? `, ${reasonWord}: ${reason}` : ''}.`,
    reason,
  };
}

async function namesFor(db: Knex, projectId: string, rows: EventRow[]): Promise<Names> {
  const userIds = [...new Set(rows.filter((r) => r.entityType === 'project_member').map((r) => r.entityId))];
  const people = new Map<string, string>();
  if (userIds.length) {
    const users: { id: string; login: string; displayName: string | null }[] = await db('users')
      .whereIn('id', userIds)
      .select('id', 'login', 'displayName');
    for (const u of users) people.set(u.id, u.displayName ?? u.login);
  }
  const campaignIds = [...new Set(rows.map((r) => r.campaignId).filter((id): id is string => id !== null))];
  const campaigns = new Map<string, string>();
  if (campaignIds.length) {
    // A deleted campaign keeps the title of its last snapshot in the history.
    const remembered: { campaignId: string; title: string | null }[] = await db('auditEvents')
      .where({ projectId, entityType: 'campaign' })
      .whereIn('campaignId', campaignIds)
      .orderBy('id', 'asc')
      .select('campaignId', db.raw(`coalesce("after"->>'title', "before"->>'title') as title`));
    for (const r of remembered) if (r.title) campaigns.set(r.campaignId, r.title);
    const live: { id: string; title: string }[] = await db('campaigns').whereIn('id', campaignIds).select('id', 'title');
    for (const c of live) campaigns.set(c.id, c.title);
  }
  return { people, campaigns };
}

/**
 * History of a project (every change in it) or of one of its campaigns, newest first, in pages
 * of `limit` entries before the cursor `before`.
 */
export async function readHistory(
  db: Knex,
  scope: { projectId: string; campaignId?: string },
  page: { limit: number; before?: number },
): Promise<HistoryPage> {
  const rows = (await auditRowsPage(db, scope, page)) as EventRow[];
  const more = rows.length > page.limit;
  const shown = rows.slice(0, page.limit);
  const names = await namesFor(db, scope.projectId, shown);
  const entries = shown.map((r) => sentenceOf({ ...r, id: Number(r.id) }, names, !scope.campaignId));
  return { entries, nextBefore: more ? entries[entries.length - 1].id : null };
}

/** A spreadsheet cannot read a cell as a formula when its text starts with one of these. */
const FORMULA_START = /^[=+\-@\t\r]/;

function csvCell(text: string): string {
  const safe = FORMULA_START.test(text) ? `'${text}` : text;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
}

/** Every entry of a history, oldest last as on screen, as CSV (UTF-8 with a byte-order mark for spreadsheet programs). */
export async function historyCsv(db: Knex, scope: { projectId: string; campaignId?: string }): Promise<string> {
  const lines = ['When (UTC),Who,What happened,Reason'];
  let before: number | undefined;
  for (;;) {
    const page = await readHistory(db, scope, { limit: 1000, before });
    for (const e of page.entries) {
      const when = `${e.at.slice(0, 10)} ${e.at.slice(11, 19)}`;
      lines.push([when, e.who, e.sentence, e.reason ?? ''].map(csvCell).join(','));
    }
    if (page.nextBefore === null) break;
    before = page.nextBefore;
  }
  return `\uFEFF${lines.join('\r\n')}\r\n`;
}
