import { LRUCache } from 'lru-cache';
import { QueryTypes } from 'sequelize';
import {
  DEFAULT_ORDER,
  PPE_ABOVE_EVERY_LEVEL,
  PPE_ERROR,
  type BusResultRow,
  type ResultsPage,
  type ResultsPageQuery,
  type ResultsSort,
  type ResultsSummary,
} from '../../shared/schemas/resultsPage';
import { BASE_SCENARIO_ID, type Model } from '../../shared/schemas/model';
import type { RunDto } from '../../shared/schemas/studies';
import type { BusResult, StudyResults } from '../../shared/schemas/studyResults';
import { parseStoredResults } from '../engine/study/storedResults';
import { StudyRun } from '../db/models';
import { ReadCache } from '../db/readCache';
import type { AuthUser } from './context';
import { ApiError } from './errors';
import { studyOptionsOf } from './runs';
import { scenarioBusResult } from './scenarioBus';
import { findStudyHead } from './scope';
import { scenarioBusOffThread } from './studyWorker';

/**
 * Study results served in pages (GET /studies/:id/results) and one bus at a time with its trace
 * (GET /studies/:id/results/buses/:busId). A run's model snapshot and results are written once, when it finishes; the
 * run row is read on every request (organization-scoped, role-checked, and its DTO compared with the cached one), so
 * the caches below only save reading and parsing the large columns again. Server-side code that needs the whole
 * results (label PDFs, the study report) reads them through `getResults` in runs.ts, not through these routes.
 */

/** The DTO columns of a run row, read by `resultsRunOf` without Sequelize's per-query overhead. */
interface RunDtoRow {
  id: string;
  organizationId: string;
  status: RunDto['status'];
  progress: number | string;
  message: string;
  modelVersion: number | string;
  startedAt: Date | string;
  finishedAt: Date | string | null;
}

/**
 * The run each study's results stand on (found or not visible: not cached), by organization, role and study: read on
 * every results request, dropped on any write of a study or a run (server/db/readCache.ts).
 */
const runOfStudy = new ReadCache<{ id: string; dto: RunDto }>('studies', 10_000);

const RUN_DTO_COLUMNS =
  '"id", "organizationId", "status", "progress", "message", "modelVersion", "startedAt", "finishedAt"';

/** A DATE column read raw: a Date from PostgreSQL, `YYYY-MM-DD HH:MM:SS.SSS +00:00` text from SQLite. */
function dateOf(v: Date | string): Date {
  const d = v instanceof Date ? v : new Date(v);
  if (Number.isNaN(d.getTime())) throw new Error(`Unreadable date in study_runs: ${String(v)}`);
  return d;
}

/**
 * The run the study's results stand on: for an approved study the approved run; otherwise the latest finished run.
 * The study is found the usual way (organization and role checked); the run by one plain SELECT of its DTO columns
 * (no large column, no model instance), answered from a covering index (migration 009). Null when there is none.
 */
async function resultsRunOf(actor: AuthUser, studyId: string): Promise<{ id: string; dto: RunDto } | null> {
  // Visibility depends on the organization and the role only (findStudyHead), so they key the cached answer.
  const cacheKey = `${actor.organizationId}\n${actor.role}\n${studyId}`;
  const hit = runOfStudy.get(cacheKey);
  if (hit) return hit;
  const readAt = runOfStudy.counter();
  const study = await findStudyHead(actor, studyId);
  const sql = study.approvedRunId
    ? // `("id" || '')`: found through the study's covering index (migration 009), not the primary key and then the row.
      `SELECT ${RUN_DTO_COLUMNS} FROM "study_runs" WHERE "studyId" = :studyId AND ("id" || '') = :runId AND "organizationId" = :organizationId`
    : `SELECT ${RUN_DTO_COLUMNS} FROM "study_runs" WHERE "studyId" = :studyId AND "organizationId" = :organizationId AND "status" = 'done' ORDER BY "startedAt" DESC LIMIT 1`;
  const rows = await StudyRun.sequelize!.query<RunDtoRow>(sql, {
    type: QueryTypes.SELECT,
    replacements: { runId: study.approvedRunId ?? '', studyId: study.id, organizationId: actor.organizationId },
  });
  const r = rows[0];
  if (!r) return null;
  const found: { id: string; dto: RunDto } = {
    id: r.id,
    dto: {
      id: r.id,
      status: r.status,
      progress: Number(r.progress),
      message: r.message,
      modelVersion: Number(r.modelVersion),
      startedAt: dateOf(r.startedAt).toISOString(),
      finishedAt: r.finishedAt === null ? null : dateOf(r.finishedAt).toISOString(),
    },
  };
  runOfStudy.set(cacheKey, found, readAt);
  return found;
}

const NO_RESULTS = 'No results yet: run the study';

type StudyPart = Omit<StudyResults, 'buses'>;

/** What the pages of one run are made from: the rows without traces, the study-wide part and the summary. */
interface ResultsIndex {
  /** JSON of the run DTO the index was built with: used only while the run still reads the same. */
  runJson: string;
  study: StudyPart;
  summary: ResultsSummary;
  /** Rows in the results' own order (the model's bus order). */
  rows: BusResultRow[];
  /** Row order per sort and direction, made on first use. */
  orders: Map<string, BusResultRow[]>;
  /** Each row's serialized JSON, made on first use. */
  rowJson: Map<BusResultRow, string>;
  /** Rough size in bytes (for the cache's budget). */
  bytes: number;
}

/** Indexes by organization and run, least recently used out first. */
const indexCache = new LRUCache<string, ResultsIndex>({
  maxSize: 96 * 1024 * 1024,
  sizeCalculation: (v) => Math.max(1, v.bytes),
});

/** One bus's serialized trace and the devices it names, by organization, run and bus. */
interface BusEntry {
  runJson: string;
  body: string;
}
const busCache = new LRUCache<string, BusEntry>({
  maxSize: 128 * 1024 * 1024,
  maxEntrySize: 16 * 1024 * 1024,
  sizeCalculation: (v) => Math.max(1, v.body.length * 2),
});

/**
 * One bus's serialized trace in a scenario that does not govern it (computed again on request, see
 * `scenarioBusBody`), by organization, run, bus and scenario.
 */
const scenarioBusCache = new LRUCache<string, BusEntry>({
  maxSize: 64 * 1024 * 1024,
  maxEntrySize: 16 * 1024 * 1024,
  sizeCalculation: (v) => Math.max(1, v.body.length * 2),
});

/** Empties the results caches (tests start from a cold cache with it). */
export function clearResultsCache(): void {
  runOfStudy.clear();
  sentBodies.clear();
  indexCache.clear();
  busCache.clear();
  scenarioBusCache.clear();
}

function governingCase(b: BusResult) {
  return b.cases.find((c) => c.arcCase === b.governing?.arcCase && c.location === b.governing?.location);
}

function ppeNameOf(b: BusResult): string {
  if (!b.labelValues) return PPE_ERROR;
  return b.labelValues.ppeLevel?.name ?? PPE_ABOVE_EVERY_LEVEL;
}

/** A bus result without its trace (`cases`), with what the table and filters need. */
export function rowOf(b: BusResult): BusResultRow {
  const { cases: _cases, ...rest } = b;
  const scenarioId = (b as { scenarioId?: unknown }).scenarioId;
  return {
    ...rest,
    governingArcingCurrentKa: governingCase(b)?.arcingCurrentKa ?? null,
    ppeName: ppeNameOf(b),
    scenarioId: typeof scenarioId === 'string' ? scenarioId : null,
  };
}

/** Counts over every bus of the results. */
export function summaryOf(buses: BusResult[]): ResultsSummary {
  const s: ResultsSummary = {
    buses: buses.length,
    ok: 0,
    errors: 0,
    withWarnings: 0,
    maxIncidentEnergyCalPerCm2: null,
    maxArcFlashBoundaryMm: null,
    bySignalWord: { DANGER: 0, WARNING: 0 },
    byPpeLevel: [],
    byEnergyBand: { le1_2: 0, le8: 0, le40: 0, gt40: 0 },
    scenarioIds: [],
  };
  const ppe = new Map<string, { count: number; rank: number }>();
  const scenarios = new Set<string>();
  for (const b of buses) {
    if (b.status === 'error') s.errors++;
    else s.ok++;
    if (b.warnings.length) s.withWarnings++;
    const e = b.incidentEnergyCalPerCm2;
    if (e !== undefined) {
      s.maxIncidentEnergyCalPerCm2 = Math.max(s.maxIncidentEnergyCalPerCm2 ?? e, e);
      if (e <= 1.2) s.byEnergyBand.le1_2++;
      else if (e <= 8) s.byEnergyBand.le8++;
      else if (e <= 40) s.byEnergyBand.le40++;
      else s.byEnergyBand.gt40++;
    }
    if (b.arcFlashBoundaryMm !== undefined)
      s.maxArcFlashBoundaryMm = Math.max(s.maxArcFlashBoundaryMm ?? b.arcFlashBoundaryMm, b.arcFlashBoundaryMm);
    if (b.labelValues) s.bySignalWord[b.labelValues.signalWord]++;
    const name = ppeNameOf(b);
    const rank = !b.labelValues ? Infinity : (b.labelValues.ppeLevel?.maxCalPerCm2 ?? Number.MAX_VALUE);
    const p = ppe.get(name);
    if (p) p.count++;
    else ppe.set(name, { count: 1, rank });
    const scenarioId = (b as { scenarioId?: unknown }).scenarioId;
    if (typeof scenarioId === 'string') scenarios.add(scenarioId);
  }
  s.byPpeLevel = [...ppe]
    .sort((a, b) => a[1].rank - b[1].rank || a[0].localeCompare(b[0]))
    .map(([name, { count }]) => ({ name, count }));
  s.scenarioIds = [...scenarios].sort();
  return s;
}

/** About the serialized size of the rows: the mean of up to 16 of them, spread over the list, times their number. */
function rowsSizeEstimate(rows: BusResultRow[]): number {
  if (!rows.length) return 0;
  const step = Math.max(1, Math.floor(rows.length / 16));
  let chars = 0;
  let n = 0;
  for (let i = 0; i < rows.length; i += step, n++) chars += JSON.stringify(rows[i]).length;
  return Math.round((chars / n) * rows.length);
}

/**
 * Reads and parses the run's results: the index is cached; for a bus request (`wantBusId`) also each bus's trace, to
 * the bus cache. A page request leaves the traces (and the model) alone: a large run's first page does not pay for
 * serializing every bus.
 */
async function loadRun(
  actor: AuthUser,
  run: { id: string; dto: RunDto },
  runJson: string,
  wantBusId?: string,
): Promise<{ index: ResultsIndex; wanted?: string }> {
  const key = `${actor.organizationId}/${run.id}`;
  const large = await StudyRun.findOne({
    where: { id: run.id, organizationId: actor.organizationId },
    attributes: wantBusId === undefined ? ['id', 'results'] : ['id', 'modelSnapshot', 'results'],
  });
  if (!large?.results) {
    indexCache.delete(key);
    throw ApiError.notFound(NO_RESULTS);
  }
  const results = parseStoredResults(large.results);
  const { buses, ...study } = results;
  const rows = buses.map(rowOf);
  const index: ResultsIndex = {
    runJson,
    study,
    summary: summaryOf(buses),
    rows,
    orders: new Map(),
    rowJson: new Map(),
    bytes: 0,
  };
  // The rows' size from a few of them serialized (each row holds its own label values): keeps the budget honest.
  index.bytes = rowsSizeEstimate(rows) + 4096;
  indexCache.set(key, index);
  if (wantBusId === undefined) return { index };

  // Each bus with the devices of the model its trace names, serialized once.
  const model = JSON.parse(large.modelSnapshot) as { devices?: { id: string; device: unknown }[] };
  const devices = new Map((model.devices ?? []).map((d) => [d.id, d]));
  const studyJson = JSON.stringify(study);
  let wanted: string | undefined;
  for (const b of buses) {
    const ids = new Set<string>();
    for (const c of b.cases) for (const d of c.devices) ids.add(d.deviceId);
    const named = [...ids].flatMap((id) => {
      const d = devices.get(id);
      return d ? [{ id: d.id, device: d.device }] : [];
    });
    const scenario = JSON.stringify(b.scenarioId ?? BASE_SCENARIO_ID);
    const body = `{"run":${runJson},"study":${studyJson},"bus":${JSON.stringify(b)},"devices":${JSON.stringify(named)},"scenarioId":${scenario},"governingScenarioId":${scenario}}`;
    busCache.set(`${key}/${b.busId}`, { runJson, body });
    if (b.busId === wantBusId) wanted = body;
  }
  return { index, wanted };
}

const inFlight = new Map<string, Promise<ResultsIndex>>();

async function indexOf(
  actor: AuthUser,
  studyId: string,
): Promise<{ run: RunDto; runJson: string; index: ResultsIndex }> {
  const run = await resultsRunOf(actor, studyId);
  if (!run) throw ApiError.notFound(NO_RESULTS);
  const runJson = JSON.stringify(run.dto);
  const hit = indexCache.get(`${actor.organizationId}/${run.id}`);
  if (hit && hit.runJson === runJson) return { run: run.dto, runJson, index: hit };
  // Concurrent cold requests for the same run share one read and parse.
  const key = `${actor.organizationId}/${run.id}\n${runJson}`;
  let loading = inFlight.get(key);
  if (!loading) {
    loading = loadRun(actor, run, runJson).then((r) => r.index);
    inFlight.set(key, loading);
    void loading.then(
      () => inFlight.delete(key),
      () => inFlight.delete(key),
    );
  }
  return { run: run.dto, runJson, index: await loading };
}

const sortKeys: Record<ResultsSort, (r: BusResultRow) => number | string | undefined> = {
  busId: (r) => r.busId,
  name: (r) => r.busName,
  kv: (r) => r.nominalKv,
  ibf: (r) => r.boltedFaultKa,
  energy: (r) => r.incidentEnergyCalPerCm2,
  boundary: (r) => r.arcFlashBoundaryMm,
  duration: (r) => r.arcDurationS,
};

/**
 * The rows in the asked order. Rows without the value (a bus that could not be evaluated) come first in a
 * descending order and last in an ascending one: an error is never hidden below the lowest hazards. Ties by bus id.
 */
function ordered(index: ResultsIndex, sort: ResultsSort, order: 'asc' | 'desc'): BusResultRow[] {
  const k = `${sort}:${order}`;
  let rows = index.orders.get(k);
  if (rows) return rows;
  const key = sortKeys[sort];
  const sign = order === 'asc' ? 1 : -1;
  rows = [...index.rows].sort((a, b) => {
    const x = key(a);
    const y = key(b);
    if (x !== y) {
      if (x === undefined) return -sign;
      if (y === undefined) return sign;
      const c = typeof x === 'string' && typeof y === 'string' ? (x < y ? -1 : 1) : (x as number) - (y as number);
      if (c !== 0) return sign * c;
    }
    return a.busId < b.busId ? -1 : a.busId > b.busId ? 1 : 0;
  });
  index.orders.set(k, rows);
  return rows;
}

function matches(r: BusResultRow, q: ResultsPageQuery): boolean {
  if (q.minCal !== undefined || q.maxCal !== undefined) {
    const e = r.incidentEnergyCalPerCm2;
    if (e === undefined) return false;
    if (q.minCal !== undefined && !(e > q.minCal)) return false;
    if (q.maxCal !== undefined && !(e <= q.maxCal)) return false;
  }
  if (q.ppe !== undefined && r.ppeName !== q.ppe) return false;
  if (q.warnings !== undefined && r.warnings.length > 0 !== q.warnings) return false;
  if (q.errors !== undefined && (r.status === 'error') !== q.errors) return false;
  if (q.scenarioId !== undefined && r.scenarioId !== q.scenarioId) return false;
  return true;
}

/** One page of a study's results: rows without traces, the paging and the whole study's summary. */
export async function resultsPage(actor: AuthUser, studyId: string, q: ResultsPageQuery): Promise<ResultsPage> {
  const { run, index } = await indexOf(actor, studyId);
  return pageOf(run, index, q);
}

function pageOf(run: RunDto, index: ResultsIndex, q: ResultsPageQuery): ResultsPage {
  const all = ordered(index, q.sort, q.order ?? DEFAULT_ORDER[q.sort]);
  const filtering =
    q.minCal !== undefined ||
    q.maxCal !== undefined ||
    q.ppe !== undefined ||
    q.warnings !== undefined ||
    q.errors !== undefined ||
    q.scenarioId !== undefined;
  const rows = filtering ? all.filter((r) => matches(r, q)) : all;
  const start = (q.page - 1) * q.pageSize;
  const pageRows = rows.slice(start, start + q.pageSize);
  return {
    run,
    study: index.study,
    summary: index.summary,
    rows: pageRows,
    total: rows.length,
    page: q.page,
    pageSize: q.pageSize,
    pages: Math.max(1, Math.ceil(rows.length / q.pageSize)),
  };
}

/** The query in one canonical string (part of the page's entity tag). */
function canonicalQuery(q: ResultsPageQuery): string {
  return JSON.stringify([
    q.sort,
    q.order ?? DEFAULT_ORDER[q.sort],
    q.minCal ?? null,
    q.maxCal ?? null,
    q.ppe ?? null,
    q.warnings ?? null,
    q.errors ?? null,
    q.scenarioId ?? null,
    q.page,
    q.pageSize,
  ]);
}

/**
 * A response body with the text its entity tag is made from: the HTTP layer (server/http/tagged.ts) answers 304 to a
 * matching If-None-Match before the body is made.
 */
export interface TaggedBody {
  etagSource: string;
  body: () => string | Buffer;
}

/**
 * Response bodies as sent (bytes), by organization and entity-tag source (the run's DTO, and the query or the bus): a
 * run's results never change once stored, so one tag always has one body. Looked up only after the request's own
 * organization-scoped, role-checked look-up of the run.
 */
const sentBodies = new LRUCache<string, Buffer>({
  maxSize: 32 * 1024 * 1024,
  maxEntrySize: 8 * 1024 * 1024,
  sizeCalculation: (b) => Math.max(1, b.length),
});

function sentBody(actor: AuthUser, etagSource: string, make: () => string): () => Buffer {
  return () => {
    const key = `${actor.organizationId}\n${etagSource}`;
    const cached = sentBodies.get(key);
    if (cached) return cached;
    const body = Buffer.from(make());
    sentBodies.set(key, body);
    return body;
  };
}

/** GET /studies/:studyId/results: one page, tagged by the run and the query. */
export async function resultsPageTagged(actor: AuthUser, studyId: string, q: ResultsPageQuery): Promise<TaggedBody> {
  const { run, runJson, index } = await indexOf(actor, studyId);
  const etagSource = `page\n${runJson}\n${canonicalQuery(q)}`;
  return { etagSource, body: sentBody(actor, etagSource, () => pageJson(run, index, q)) };
}

/** A page's JSON text (each row serialized once per index). */
function pageJson(run: RunDto, index: ResultsIndex, q: ResultsPageQuery): string {
  const { rows, ...rest } = pageOf(run, index, q);
  const rowsJson = rows.map((r) => {
    let j = index.rowJson.get(r);
    if (j === undefined) index.rowJson.set(r, (j = JSON.stringify(r)));
    return j;
  });
  const head = JSON.stringify(rest);
  return `${head.slice(0, -1)},"rows":[${rowsJson.join(',')}]}`;
}

/** One bus of the study's results with its whole trace; 404 for a bus the results do not have. */
export async function busResultBody(
  actor: AuthUser,
  studyId: string,
  busId: string,
): Promise<{ runJson: string; body: string }> {
  const run = await resultsRunOf(actor, studyId);
  if (!run) throw ApiError.notFound(NO_RESULTS);
  const runJson = JSON.stringify(run.dto);
  const key = `${actor.organizationId}/${run.id}`;
  const hit = busCache.get(`${key}/${busId}`);
  if (hit && hit.runJson === runJson) return { runJson, body: hit.body };
  const index = indexCache.get(key);
  // A bus the (current) index does not list does not exist: no need to read the run again.
  if (index && index.runJson === runJson && !index.rows.some((r) => r.busId === busId))
    throw ApiError.notFound(`No bus ${busId} in the results`);
  // Concurrent cold requests for the run's buses share one read, parse and serialization of every trace.
  const flightKey = `${key}\n${runJson}`;
  let loading = inFlightTraces.get(flightKey);
  if (!loading) {
    loading = loadRun(actor, run, runJson, busId).then(() => undefined);
    inFlightTraces.set(flightKey, loading);
    const done = () => inFlightTraces.delete(flightKey);
    void loading.then(done, done);
  }
  await loading;
  const loaded = busCache.get(`${key}/${busId}`);
  if (loaded && loaded.runJson === runJson) return { runJson, body: loaded.body };
  const after = indexCache.get(key);
  if (after && after.runJson === runJson && !after.rows.some((r) => r.busId === busId))
    throw ApiError.notFound(`No bus ${busId} in the results`);
  // Not among the traces just loaded (or already pushed out of the cache by others): this bus alone.
  const { wanted } = await loadRun(actor, run, runJson, busId);
  if (wanted === undefined) throw ApiError.notFound(`No bus ${busId} in the results`);
  return { runJson, body: wanted };
}

const inFlightTraces = new Map<string, Promise<void>>();

/** GET /studies/:studyId/results/buses/:busId(?scenario=…), tagged by the run, the bus and the scenario. */
export async function busResultTagged(
  actor: AuthUser,
  studyId: string,
  busId: string,
  scenario?: string,
): Promise<TaggedBody> {
  if (scenario !== undefined) {
    const { runJson, body } = await scenarioBusBody(actor, studyId, busId, scenario);
    const etagSource = `bus\n${runJson}\n${busId}\n${scenario}`;
    return { etagSource, body: sentBody(actor, etagSource, () => body) };
  }
  const { runJson, body } = await busResultBody(actor, studyId, busId);
  const etagSource = `bus\n${runJson}\n${busId}`;
  return { etagSource, body: sentBody(actor, etagSource, () => body) };
}

/**
 * Models up to this many labelled buses, and this much JSON, have a bus computed again in the main thread: building
 * such a network and evaluating one bus takes a few milliseconds, less than handing the model to the study worker.
 * Larger models go to the worker (`scenarioBusOffThread`), so an engineer opening a trace never holds up the other
 * requests. (A bus of a stored model is about 550 characters of JSON with its elements: 200 000 is some 360 buses,
 * labelled or not.)
 */
export const SCENARIO_BUS_MAIN_THREAD_MAX_BUSES = 300;
export const SCENARIO_BUS_MAIN_THREAD_MAX_CHARS = 200_000;

const inFlightBuses = new Map<string, Promise<string>>();

/**
 * One bus in a given operating scenario. The governing scenario's trace is the stored one (`busResultBody`). Another
 * scenario's trace is not stored (only its summary, in the bus's `scenarios`): it is computed again from the run's
 * model and settings snapshots with that scenario applied (server/services/scenarioBus.ts) — the same engine and
 * inputs as the run, so the same numbers — and cached. The bus keeps the stored `scenarios` (the spread) and its
 * `scenarioId` is the scenario shown; `governingScenarioId` names the one the label takes. An id that is not a
 * scenario of the run is 400 naming `scenario`; a scenario in which no source reaches the bus is 409 naming
 * `scenario` (there is no trace to show; its `scenarios` entry says so).
 */
export async function scenarioBusBody(
  actor: AuthUser,
  studyId: string,
  busId: string,
  scenario: string,
): Promise<{ runJson: string; body: string }> {
  const { run, runJson, index } = await indexOf(actor, studyId);
  const known = index.study.scenarios?.map((s) => s.id) ?? [BASE_SCENARIO_ID];
  if (!known.includes(scenario)) {
    const message = `No scenario "${scenario}" in the model of this run (${known.join(', ')})`;
    throw new ApiError('bad_request', message, { scenario: message });
  }
  const row = index.rows.find((r) => r.busId === busId);
  if (!row) throw ApiError.notFound(`No bus ${busId} in the results`);
  const governing = row.scenarioId ?? BASE_SCENARIO_ID;
  if (scenario === governing) return busResultBody(actor, studyId, busId);
  const entry = row.scenarios?.find((s) => s.scenarioId === scenario);
  if (entry?.status === 'de-energized') {
    const message = `${busId} is de-energized in scenario "${entry.name}": ${entry.note ?? 'no source in service reaches it'}`;
    throw new ApiError('conflict', message, { scenario: message });
  }

  const key = `${actor.organizationId}/${run.id}/${busId}/${scenario}`;
  const hit = scenarioBusCache.get(key);
  if (hit && hit.runJson === runJson) return { runJson, body: hit.body };
  const flightKey = `${key}\n${runJson}`;
  let computing = inFlightBuses.get(flightKey);
  if (!computing) {
    computing = computeScenarioBus(actor, run.id, runJson, index, busId, scenario, governing);
    inFlightBuses.set(flightKey, computing);
    void computing.then(
      () => inFlightBuses.delete(flightKey),
      () => inFlightBuses.delete(flightKey),
    );
  }
  const body = await computing;
  scenarioBusCache.set(key, { runJson, body });
  return { runJson, body };
}

async function computeScenarioBus(
  actor: AuthUser,
  runId: string,
  runJson: string,
  index: ResultsIndex,
  busId: string,
  scenario: string,
  governing: string,
): Promise<string> {
  const large = await StudyRun.findOne({
    where: { id: runId, organizationId: actor.organizationId },
    attributes: ['id', 'modelSnapshot', 'settingsSnapshot'],
  });
  if (!large) throw ApiError.notFound(NO_RESULTS);
  const options = studyOptionsOf(large.settingsSnapshot);
  // The runner cache key: a run's snapshots never change.
  const runnerKey = `${actor.organizationId}/${runId}/${scenario}`;
  const outcome =
    index.rows.length <= SCENARIO_BUS_MAIN_THREAD_MAX_BUSES &&
    large.modelSnapshot.length <= SCENARIO_BUS_MAIN_THREAD_MAX_CHARS
      ? scenarioBusResult(JSON.parse(large.modelSnapshot) as Model, options, scenario, busId, runnerKey)
      : await scenarioBusOffThread(large.modelSnapshot, options, scenario, busId, runnerKey);
  if (outcome.kind === 'unknown-scenario') {
    const message = `No scenario "${scenario}" in the model of this run`;
    throw new ApiError('bad_request', message, { scenario: message });
  }
  if (outcome.kind === 'unknown-bus') throw ApiError.notFound(`No bus ${busId} in the results`);
  if (outcome.kind === 'de-energized') {
    const message = `${busId} is de-energized in scenario "${scenario}": no source in service reaches it`;
    throw new ApiError('conflict', message, { scenario: message });
  }
  const row = index.rows.find((r) => r.busId === busId)!;
  const stored = row.scenarios?.find((s) => s.scenarioId === scenario);
  const bus: BusResult = { ...outcome.bus, scenarioId: scenario, scenarios: row.scenarios };
  // Said on the result itself, so that no reader takes this scenario's numbers for the label's.
  const g = row.scenarios?.find((s) => s.scenarioId === governing);
  const labelEnergy = g?.incidentEnergyCalPerCm2;
  bus.warnings = [
    ...bus.warnings,
    {
      code: 'SCENARIO_NOT_GOVERNING',
      message:
        `This is the bus in scenario "${stored?.name ?? scenario}", not the label's basis: the label takes ` +
        `"${g?.name ?? governing}"` +
        (g?.status === 'error'
          ? ', which could not be evaluated at this bus (no label value is given).'
          : `${labelEnergy === undefined ? '' : ` (${labelEnergy.toPrecision(3)} cal/cm²)`}, the highest incident energy of the scenarios.`),
    },
  ];
  // The run's summary of this scenario and the trace computed now come from the same engine and inputs; should the
  // engine have changed since the run, say so (and keep the higher hazard in view: the label is the run's).
  const then = stored?.incidentEnergyJPerCm2;
  const now = bus.incidentEnergyJPerCm2;
  if (then !== undefined && now !== undefined && Math.abs(then - now) > 1e-9 * Math.max(1, Math.abs(then))) {
    bus.warnings = [
      ...bus.warnings,
      {
        code: 'SCENARIO_RECOMPUTED_DIFFERS',
        message: `This trace, computed again now, gives ${(now / 4.184).toPrecision(3)} cal/cm²; the run recorded ${(then / 4.184).toPrecision(3)} cal/cm² for this scenario. The engine has changed since the run: run the study again.`,
      },
    ];
  }
  // The model's devices its trace names come with the outcome (the model is not parsed again here).
  return `{"run":${runJson},"study":${JSON.stringify(index.study)},"bus":${JSON.stringify(bus)},"devices":${JSON.stringify(outcome.devices)},"scenarioId":${JSON.stringify(scenario)},"governingScenarioId":${JSON.stringify(governing)}}`;
}
