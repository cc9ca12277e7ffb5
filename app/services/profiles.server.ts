import { createHash } from "node:crypto";
import { StringDecoder } from "node:string_decoder";
import type { Transaction } from "sequelize";
import type { Connection as MariaDbConnection } from "mariadb";
import { LoadProfile, LoadProfileSeries, LoadProfileVersion, Study } from "../../db/models";
import { createIngester, IngestError, type IngestResult } from "../../lib/ingest/ingest";
import { ampsBlobView, decodeAmps, decodeTimes, encodeTimes } from "../../lib/series-codec";
import { ingestOptionsSchema } from "../../shared/ingest-options";
import { defaultMaxGapSeconds, PHASES, selectPhase, type Phase, type PhaseChoice, type ProfileSeries } from "../../lib/series";
import { decimateForChart } from "../../lib/engine/timeline";
import { packTimeline } from "../../shared/packed-timeline";
import { chartBuckets, zoomRange, type ZoomView } from "../../shared/zoom";
import { localMonthlyCoverage } from "../../lib/engine/local-months";
import { buildQualityReport, type QualityCounts, type QualityReport } from "../../lib/ingest/quality";
import { addCounts, mergeNewerWins, phasesOf } from "../../lib/ingest/append";
import type { EncodedProfile } from "../../lib/engine/worker";
import { db, inTransaction } from "../utils/db.server";
import { getEnv } from "../utils/env.server";
import { audit, type Actor } from "./audit.server";
import { getCircuit } from "./circuits.server";
import { InputError, NotFoundError } from "./errors.server";
import { emitWebhookEvent } from "./webhooks.server";
import { mergeRecordedTemperatures } from "../../lib/ingest/temperatures";

export function profileJson(p: LoadProfile) {
  return {
    id: p.id,
    circuitId: p.circuitId,
    name: p.name,
    phases: p.phases.split("") as Phase[],
    start: p.startAt.toISOString(),
    end: p.endAt.toISOString(),
    samples: p.samples,
    sourceFile: p.sourceFile,
    mapping: p.mapping,
    dataVersion: p.dataVersion,
    fingerprint: p.fingerprint,
    temperature: p.temperature ?? null,
    createdAt: p.createdAt.toISOString(),
  };
}

export async function listProfiles(organisationId: number, circuitId: number) {
  db();
  await getCircuit(organisationId, circuitId);
  return LoadProfile.findAll({ where: { organisationId, circuitId }, order: [["createdAt", "DESC"]] });
}

export async function getProfile(organisationId: number, id: number): Promise<LoadProfile> {
  db();
  const p = await LoadProfile.findOne({ where: { id, organisationId } });
  if (!p) throw new NotFoundError(`Load profile ${id}`);
  return p;
}

type SeriesBlobs = Pick<LoadProfileSeries, "times" | "phaseA" | "phaseB" | "phaseC">;

/**
 * The sample BLOBs of a profile's data version: the current one, or an earlier one kept because a
 * study ran on it. Null when that version was not kept (no study used it, or it predates versions).
 */
async function seriesRow(organisationId: number, id: number, version?: number): Promise<SeriesBlobs | null> {
  const profile = await getProfile(organisationId, id);
  if (version === undefined || version === profile.dataVersion) {
    const row = await LoadProfileSeries.findByPk(id);
    if (!row) throw new NotFoundError(`Samples of load profile ${id}`);
    return row;
  }
  return LoadProfileVersion.findOne({ where: { profileId: id, version } });
}

function decodeRow(row: SeriesBlobs): ProfileSeries {
  const phases: ProfileSeries["phases"] = {};
  if (row.phaseA) phases.A = decodeAmps(row.phaseA);
  if (row.phaseB) phases.B = decodeAmps(row.phaseB);
  if (row.phaseC) phases.C = decodeAmps(row.phaseC);
  return { t: decodeTimes(row.times), phases };
}

/** The stored samples of a profile, decoded from the compact BLOBs. */
export async function loadProfileSeries(organisationId: number, id: number): Promise<ProfileSeries> {
  return decodeRow((await seriesRow(organisationId, id))!);
}

/** The samples of one data version of a profile; null when that version was not kept. */
export async function loadProfileSeriesVersion(organisationId: number, id: number, version: number | undefined): Promise<ProfileSeries | null> {
  const row = await seriesRow(organisationId, id, version);
  return row ? decodeRow(row) : null;
}

/**
 * A profile's sample BLOBs as stored (series-codec format), for the engine worker to decode: the
 * current data, or the data version given when it was kept.
 */
export async function loadProfileBlobs(organisationId: number, id: number, version?: number): Promise<EncodedProfile> {
  const row = await seriesRow(organisationId, id, version);
  if (!row) throw new NotFoundError(`Data version ${version} of load profile ${id}`);
  const phases: EncodedProfile["phases"] = {};
  if (row.phaseA) phases.A = row.phaseA;
  if (row.phaseB) phases.B = row.phaseB;
  if (row.phaseC) phases.C = row.phaseC;
  return { times: row.times, phases };
}

/**
 * Feeds a byte stream (a request body) through the streaming CSV ingester, chunk by chunk.
 * `expectedBytes`: the body's declared length, when there is one (sizes the sample arrays once).
 */
export async function ingestByteStream(
  body: ReadableStream<Uint8Array> | AsyncIterable<Uint8Array>,
  rawOptions: Record<string, unknown>,
  maxBytes = getEnv().UPLOAD_MAX_BYTES,
  expectedBytes?: number,
  /** The circuit's zone: recorded temperatures are averaged by its calendar months. */
  monthsTimeZone?: string,
): Promise<IngestResult> {
  const chunks = (body as AsyncIterable<Uint8Array>)[Symbol.asyncIterator]();
  try {
    const options = ingestOptionsSchema.parse(rawOptions);
    const ingester = createIngester(options, { maxBytes, expectedBytes, monthsTimeZone });
    // Node's StringDecoder: UTF-8 split across chunks, invalid bytes as U+FFFD, like TextDecoder,
    // but about 4× faster here. It keeps a byte-order mark, which the ingester drops.
    const decoder = new StringDecoder("utf8");
    // Bytes are counted here (the size limit), so the ingester need not count them in the text.
    let uncountedBytes = 0;
    for (let next = await chunks.next(); !next.done; next = await chunks.next()) {
      uncountedBytes += next.value.byteLength;
      const text = decoder.write(next.value);
      if (text) {
        ingester.write(text, uncountedBytes);
        uncountedBytes = 0;
      }
    }
    const tail = decoder.end();
    if (tail || uncountedBytes) ingester.write(tail, uncountedBytes);
    return ingester.end();
  } catch (error) {
    // Read what is left of the body before answering: a client still sending when the
    // answer arrives sees a broken connection instead of the message. Not for a file
    // over the size limit, which is refused at once.
    if (!(error instanceof IngestError && error.status === 413)) {
      try {
        for (let next = await chunks.next(); !next.done; next = await chunks.next());
      } catch {
        // The rest ran past the size limit: it is dropped as it arrives (utils/body.server.ts).
      }
    }
    throw error;
  }
}

/** A Buffer over the same bytes (no copy: the sample BLOBs run to tens of MB). */
const bufferView = (bytes: Uint8Array) => Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);

interface EncodedRow {
  times: Buffer;
  phaseA: Buffer | null;
  phaseB: Buffer | null;
  phaseC: Buffer | null;
  /** SHA-256 (hex) of the BLOBs in column order: equal data, equal fingerprint. */
  fingerprint: string;
}

/** The BLOBs of a series (series-codec) and their fingerprint. */
function encodeSeries(series: ProfileSeries): EncodedRow {
  const times = bufferView(encodeTimes(series.t));
  // Views of the series' own bytes: the row is written before anything changes the series.
  const amps = (p: Phase) => (series.phases[p] ? bufferView(ampsBlobView(series.phases[p]!)) : null);
  const row = { times, phaseA: amps("A"), phaseB: amps("B"), phaseC: amps("C") };
  const hash = createHash("sha256");
  for (const blob of [row.times, row.phaseA, row.phaseB, row.phaseC]) {
    // The length first, so that moving bytes between columns changes the fingerprint.
    hash.update(String(blob?.byteLength ?? -1) + ":");
    if (blob) hash.update(blob);
  }
  return { ...row, fingerprint: hash.digest("hex") };
}

/**
 * Inserts the samples row as a prepared statement on the transaction's connection: the
 * binary protocol sends the BLOBs as raw bytes. Through the model they are escaped into the
 * SQL text, which the driver and then the server scan byte by byte (about 3× slower for a year
 * of minutes, and an extra copy of every BLOB in memory).
 */
async function insertSeriesRow(transaction: Transaction, profileId: number, encoded: EncodedRow) {
  const row = { profileId, ...encoded };
  const attributes = LoadProfileSeries.getAttributes();
  const keys = ["profileId", "times", "phaseA", "phaseB", "phaseC"] as const;
  const columns = keys.map((k) => `\`${attributes[k].field ?? k}\``).join(", ");
  const sql = `INSERT INTO \`${LoadProfileSeries.tableName}\` (${columns}) VALUES (${keys.map(() => "?").join(", ")})`;
  // Sequelize keeps the driver's connection on the transaction (mariadb dialect).
  const { connection } = transaction as unknown as { connection: Pick<MariaDbConnection, "execute"> };
  await connection.execute(sql, keys.map((k) => row[k]));
}

/**
 * Before a profile's data changes: keeps the current samples as a data version when a study ran
 * on the profile (copied inside the database, not through the app), so the study's page still
 * shows the data it was computed from. Without studies nothing needs keeping.
 */
async function keepDataForStudies(profile: LoadProfile, how: "appended" | "replaced", transaction: Transaction) {
  const studies = await Study.count({ where: { profileId: profile.id }, transaction });
  if (studies === 0) return false;
  const v = LoadProfileVersion.getAttributes();
  const col = (k: keyof typeof v) => `\`${v[k].field ?? k}\``;
  const sql =
    `INSERT INTO \`${LoadProfileVersion.tableName}\` (${[col("profileId"), col("version"), col("times"), col("phaseA"), col("phaseB"), col("phaseC"), col("fingerprint"), col("samples"), col("startAt"), col("endAt"), col("supersededBy"), col("supersededAt")].join(", ")}) ` +
    `SELECT profile_id, ?, times, phase_a, phase_b, phase_c, ?, ?, ?, ?, ?, ? FROM \`${LoadProfileSeries.tableName}\` WHERE profile_id = ?`;
  await profile.sequelize.query(sql, {
    replacements: [profile.dataVersion, profile.fingerprint, profile.samples, profile.startAt, profile.endAt, how, new Date(), profile.id],
    transaction,
  });
  return true;
}

/** Swaps a profile's samples for new ones (the row is replaced, as BLOBs are not patched in place). */
async function writeNewData(profile: LoadProfile, encoded: EncodedRow, how: "appended" | "replaced", transaction: Transaction) {
  const kept = await keepDataForStudies(profile, how, transaction);
  await LoadProfileSeries.destroy({ where: { profileId: profile.id }, transaction });
  await insertSeriesRow(transaction, profile.id, encoded);
  return kept;
}

/** Stores an ingested profile: metadata row and samples in one transaction, so nothing half-saved. */
export async function saveProfile(
  actor: Actor,
  circuitId: number,
  result: IngestResult,
  meta: { name?: string; sourceFile?: string | null; mapping: Record<string, unknown> },
  outer?: Transaction,
): Promise<LoadProfile> {
  db();
  await getCircuit(actor.organisationId, circuitId);
  const { series, quality } = result;
  const name = meta.name?.trim() || meta.sourceFile || `Profile ${result.start.slice(0, 10)} – ${result.end.slice(0, 10)}`;
  const encoded = encodeSeries(series);
  return inTransaction(outer, async (transaction) => {
    const profile = await LoadProfile.create(
      {
        organisationId: actor.organisationId,
        circuitId,
        name: name.slice(0, 200),
        phases: PHASES.filter((p) => series.phases[p]).join(""),
        startAt: new Date(result.start),
        endAt: new Date(result.end),
        samples: series.t.length,
        sourceFile: meta.sourceFile?.slice(0, 255) ?? null,
        mapping: meta.mapping,
        quality: { ...quality, warnings: result.warnings } as unknown as Record<string, unknown>,
        createdBy: actor.id,
        fingerprint: encoded.fingerprint,
        temperature: result.temperature,
      },
      { transaction },
    );
    await insertSeriesRow(transaction, profile.id, encoded);
    await audit(actor, "profile.uploaded", "load-profile", profile.id, { circuitId, name: profile.name, samples: profile.samples }, transaction);
    await emitWebhookEvent(
      actor.organisationId,
      "profile.uploaded",
      { profileId: profile.id, circuitId, name: profile.name, samples: profile.samples, start: profile.startAt.toISOString(), end: profile.endAt.toISOString(), url: `/api/v1/profiles/${profile.id}` },
      transaction,
    );
    return profile;
  });
}

/** The counts a stored quality report was built from (rows read, invalid by reason, per phase). */
function countsOf(q: QualityReport): QualityCounts {
  const perPhase = q.perPhase ? Object.fromEntries(Object.entries(q.perPhase).map(([p, v]) => [p, v?.invalid ?? {}])) : undefined;
  return { rowsRead: q.rowsRead, invalid: q.invalid ?? {}, duplicates: q.duplicates, outOfOrder: q.outOfOrder, ...(perPhase ? { perPhaseInvalid: perPhase } : {}) };
}

/**
 * Appends a newer export to a profile: the new file wins over its whole time span (stored samples
 * from its first to its last timestamp are replaced), the quality report is rebuilt over the
 * merged history, and everything is saved in one transaction. Studies keep their saved results.
 */
export async function appendToProfile(actor: Actor, id: number, result: IngestResult, meta: { sourceFile?: string | null; mapping: Record<string, unknown> }) {
  const sequelize = db();
  const profile = await getProfile(actor.organisationId, id);
  const stored = await loadProfileSeries(actor.organisationId, id);
  const had = phasesOf(stored).join("");
  const got = phasesOf(result.series).join("");
  if (had !== got) {
    throw new InputError(`This profile holds phase(s) ${had.split("").join(", ")}; the new file maps ${got.split("").join(", ")}. Map the same phases to append.`, "phaseA", 422);
  }
  const merged = mergeNewerWins(stored, result.series);
  const storedQuality = profile.quality as unknown as QualityReport & { warnings?: string[] };
  const counts = addCounts(countsOf(storedQuality), countsOf(result.quality));
  const quality = buildQualityReport(merged.series, counts);
  if (result.quality.conversion) quality.conversion = result.quality.conversion;
  else if (storedQuality.conversion) quality.conversion = storedQuality.conversion;
  const n = merged.series.t.length;
  const note = `Appended ${merged.added} samples from ${meta.sourceFile ?? "a newer export"} (${result.start.slice(0, 16)} – ${result.end.slice(0, 16)} UTC); ${merged.replaced} stored samples in that span were replaced (the newer upload wins).`;
  const warnings = [...(storedQuality.warnings ?? []), ...result.warnings, note];
  const appended = [...(((profile.mapping as Record<string, unknown>).appended as unknown[]) ?? []), { ...meta.mapping, sourceFile: meta.sourceFile ?? null, at: new Date().toISOString() }];
  const encoded = encodeSeries(merged.series);
  await sequelize.transaction(async (transaction) => {
    await writeNewData(profile, encoded, "appended", transaction);
    await profile.update(
      {
        startAt: new Date(merged.series.t[0] * 1000),
        endAt: new Date(merged.series.t[n - 1] * 1000),
        samples: n,
        mapping: { ...profile.mapping, appended },
        quality: { ...quality, warnings } as unknown as Record<string, unknown>,
        dataVersion: profile.dataVersion + 1,
        fingerprint: encoded.fingerprint,
        temperature: mergeRecordedTemperatures(profile.temperature ?? null, result.temperature),
      },
      { transaction },
    );
    await audit(actor, "profile.appended", "load-profile", id, { added: merged.added, replaced: merged.replaced, samples: n }, transaction);
  });
  return { profile, added: merged.added, replaced: merged.replaced, quality: { ...quality, warnings } };
}

/**
 * Replaces a profile's data with a new export (a corrected or re-exported history): samples,
 * phases, mapping and quality report are the new file's. Studies that ran on the old data keep
 * it (a kept data version), so their pages still show what they were computed from.
 */
export async function replaceProfileData(actor: Actor, id: number, result: IngestResult, meta: { sourceFile?: string | null; mapping: Record<string, unknown> }) {
  const sequelize = db();
  const profile = await getProfile(actor.organisationId, id);
  const encoded = encodeSeries(result.series);
  const from = profile.dataVersion;
  const note = `Data replaced by ${meta.sourceFile ?? "a new export"} on ${new Date().toISOString().slice(0, 16)} UTC (data version ${from + 1}); studies run before keep the data they were computed from.`;
  const quality = { ...result.quality, warnings: [...result.warnings, note] };
  const replaced = [...(((profile.mapping as Record<string, unknown>).replaced as unknown[]) ?? []), { sourceFile: profile.sourceFile, version: from, at: new Date().toISOString() }];
  let kept = false;
  await sequelize.transaction(async (transaction) => {
    kept = await writeNewData(profile, encoded, "replaced", transaction);
    await profile.update(
      {
        phases: PHASES.filter((p) => result.series.phases[p]).join(""),
        startAt: new Date(result.start),
        endAt: new Date(result.end),
        samples: result.series.t.length,
        sourceFile: meta.sourceFile?.slice(0, 255) ?? profile.sourceFile,
        mapping: { ...meta.mapping, replaced },
        quality: quality as unknown as Record<string, unknown>,
        dataVersion: from + 1,
        fingerprint: encoded.fingerprint,
        temperature: result.temperature,
      },
      { transaction },
    );
    await audit(actor, "profile.replaced", "load-profile", id, { fromVersion: from, toVersion: from + 1, samples: result.series.t.length, keptForStudies: kept }, transaction);
  });
  return { profile, quality, keptForStudies: kept };
}

export async function deleteProfile(actor: Actor, id: number) {
  const sequelize = db();
  const profile = await getProfile(actor.organisationId, id);
  await sequelize.transaction(async (transaction) => {
    await LoadProfileSeries.destroy({ where: { profileId: id }, transaction });
    await profile.destroy({ transaction });
    await audit(actor, "profile.deleted", "load-profile", id, { name: profile.name }, transaction);
  });
  return profile.circuitId;
}


/** Everything the profile page shows: metadata, quality report and the current-over-time chart data. */
export async function profileOverview(organisationId: number, id: number, view: ZoomView & { phase?: string }, timeZone = "UTC") {
  const profile = await getProfile(organisationId, id);
  const series = await loadProfileSeries(organisationId, id);
  const phases = (PHASES as readonly Phase[]).filter((p) => series.phases[p]);
  const phase: PhaseChoice = view.phase === "min" || phases.includes(view.phase as Phase) ? (view.phase as PhaseChoice) : phases[0];
  const channel = selectPhase(series, phase);
  const whole = { start: Math.floor(profile.startAt.getTime() / 1000), end: Math.ceil(profile.endAt.getTime() / 1000) };
  const range = zoomRange(whole, view, timeZone);
  const maxGapSeconds = defaultMaxGapSeconds(series.t);
  const quality = profile.quality as unknown as QualityReport;
  const chart = decimateForChart(channel, { ...range, buckets: chartBuckets(range, quality.medianIntervalSeconds), maxGapSeconds });
  // Every unknown stretch of the whole profile (the quality report keeps only the longest ten).
  const gaps = range === whole ? chart.unknown : decimateForChart(channel, { ...whole, buckets: 1, maxGapSeconds }).unknown;
  // The stored report counts UTC months; the page counts the circuit's months (docs/computation.md).
  const localCoverage = localMonthlyCoverage(series.t, maxGapSeconds, timeZone);
  return { profile: { ...profileJson(profile), quality: profile.quality as unknown as QualityReport & { warnings?: string[] } }, localCoverage, phase, phases, chart: packTimeline(chart), gaps, range, whole };
}
