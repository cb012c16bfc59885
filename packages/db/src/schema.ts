/**
 * The Turnstone domain model (DESIGN.md "Domain model"), MariaDB dialect.
 * Times are UTC DATETIME(3). Every table that the screens or the worker filter by has an
 * index named after the query it serves.
 */
import {
  bigint,
  boolean,
  date,
  datetime,
  double,
  index,
  int,
  mysqlEnum,
  mysqlTable,
  primaryKey,
  smallint,
  text,
  uniqueIndex,
  varchar,
} from 'drizzle-orm/mysql-core';
import { sql } from 'drizzle-orm';
import { compressedJsonColumn, jsonColumn, mediumBlob } from './column-types.ts';

const id = () => int('id').autoincrement().primaryKey();
const bigId = () => bigint('id', { mode: 'number', unsigned: true }).autoincrement().primaryKey();
const ref = (name: string) => int(name);
const bigRef = (name: string) => bigint(name, { mode: 'number', unsigned: true });
const at = (name: string) => datetime(name, { mode: 'date', fsp: 3 });
const createdAt = () =>
  at('created_at')
    .notNull()
    .default(sql`CURRENT_TIMESTAMP(3)`);

export const roleEnum = ['admin', 'engineer', 'planner', 'operator'] as const;
export const machineTypeEnum = ['motor', 'pump', 'fan', 'blower', 'gearbox', 'compressor'] as const;
export const encodingEnum = ['int16', 'int24', 'int32', 'float32'] as const;
export const verdictEnum = ['ok', 'suspect', 'unusable'] as const;

// ---------------------------------------------------------------- machine tree

export const sites = mysqlTable(
  'sites',
  {
    id: id(),
    code: varchar('code', { length: 32 }).notNull(),
    name: varchar('name', { length: 200 }).notNull(),
    timeZone: varchar('time_zone', { length: 64 }).notNull().default('UTC'),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('sites_code_uq').on(t.code)],
);

export const areas = mysqlTable(
  'areas',
  {
    id: id(),
    siteId: ref('site_id')
      .notNull()
      .references(() => sites.id),
    name: varchar('name', { length: 200 }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('areas_site_name_uq').on(t.siteId, t.name)],
);

export const machines = mysqlTable(
  'machines',
  {
    id: id(),
    areaId: ref('area_id')
      .notNull()
      .references(() => areas.id),
    name: varchar('name', { length: 200 }).notNull(),
    type: mysqlEnum('type', machineTypeEnum).notNull(),
    nominalRpm: double('nominal_rpm').notNull(),
    /** ISO 20816-3 machine group: 1 large (300 kW–50 MW), 2 medium (15–300 kW). */
    isoGroup: smallint('iso_group').notNull().default(2),
    foundation: mysqlEnum('foundation', ['rigid', 'flexible']).notNull().default('rigid'),
    criticality: mysqlEnum('criticality', ['low', 'medium', 'high']).notNull().default('medium'),
    powerKw: double('power_kw'),
    bladeCount: smallint('blade_count'),
    vaneCount: smallint('vane_count'),
    /**
     * Electrical supply (line) frequency of the machine's motor, Hz: 50 or 60; null when the
     * machine has no mains-fed motor on the measured train or the frequency is unknown (an
     * inverter drive, say). The diagnosis looks for 2 × this frequency.
     */
    lineHz: smallint('line_hz'),
    /** Belt drive: driver and driven sheave diameters and belt length, millimetres. */
    belt: jsonColumn<{
      driverSheaveMm: number;
      drivenSheaveMm: number;
      beltLengthMm: number;
    } | null>('belt'),
    notes: text('notes'),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('machines_area_name_uq').on(t.areaId, t.name)],
);

export const bearings = mysqlTable(
  'bearings',
  {
    id: id(),
    machineId: ref('machine_id')
      .notNull()
      .references(() => machines.id, { onDelete: 'cascade' }),
    /** Position on the machine, e.g. "Motor DE". */
    name: varchar('name', { length: 100 }).notNull(),
    designation: varchar('designation', { length: 64 }),
    rollingElements: smallint('rolling_elements').notNull(),
    ballDiameterMm: double('ball_diameter_mm').notNull(),
    pitchDiameterMm: double('pitch_diameter_mm').notNull(),
    contactAngleDeg: double('contact_angle_deg').notNull().default(0),
    /** Shaft speed of this bearing as a multiple of the machine's running speed. */
    speedRatio: double('speed_ratio').notNull().default(1),
  },
  (t) => [index('bearings_machine_idx').on(t.machineId)],
);

export const gears = mysqlTable(
  'gears',
  {
    id: id(),
    machineId: ref('machine_id')
      .notNull()
      .references(() => machines.id, { onDelete: 'cascade' }),
    name: varchar('name', { length: 100 }).notNull(),
    /** Teeth on the gear turning at `speedRatio` × running speed, and on its mate. */
    teeth: smallint('teeth').notNull(),
    mateTeeth: smallint('mate_teeth').notNull(),
    speedRatio: double('speed_ratio').notNull().default(1),
  },
  (t) => [index('gears_machine_idx').on(t.machineId)],
);

export const points = mysqlTable(
  'points',
  {
    id: id(),
    machineId: ref('machine_id')
      .notNull()
      .references(() => machines.id),
    /**
     * The site of the point's machine's area, kept here so a tag can be unique per site (a
     * database index cannot reach through machines and areas). The set-up service writes it
     * with the machine: on creating a point, moving it to another machine, and moving a
     * machine to an area of another site.
     */
    siteId: ref('site_id')
      .notNull()
      .references(() => sites.id),
    /**
     * External tag the gateway uses; unique within the point's site. Another site may use
     * the same tag: a gateway only ever addresses the points of its own site.
     */
    tag: varchar('tag', { length: 64 }).notNull(),
    name: varchar('name', { length: 200 }).notNull(),
    location: varchar('location', { length: 100 }).notNull(),
    direction: mysqlEnum('direction', ['H', 'V', 'A']).notNull(),
    sensitivityMvPerG: double('sensitivity_mv_per_g').notNull().default(100),
    bearingId: ref('bearing_id').references(() => bearings.id, { onDelete: 'set null' }),
    fmaxHz: double('fmax_hz').notNull().default(1000),
    lines: int('lines').notNull().default(1600),
    /**
     * Envelope band-pass edges in Hz, set by the engineer around the resonance the bearing
     * impacts excite; both null = the default from each capture's sample rate.
     */
    envelopeLoHz: double('envelope_lo_hz'),
    envelopeHiHz: double('envelope_hi_hz'),
    /** Latest analysed capture, kept by the worker so the fleet view needs no scan. */
    lastTakenAt: at('last_taken_at'),
    lastVerdict: mysqlEnum('last_verdict', verdictEnum),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('points_site_tag_uq').on(t.siteId, t.tag),
    index('points_machine_idx').on(t.machineId),
  ],
);

// ---------------------------------------------------------------- users and access

export const users = mysqlTable(
  'users',
  {
    id: id(),
    email: varchar('email', { length: 254 }).notNull(),
    name: varchar('name', { length: 200 }).notNull(),
    role: mysqlEnum('role', roleEnum).notNull(),
    /** bcrypt hash; null until an invited user sets a password. */
    passwordHash: varchar('password_hash', { length: 100 }),
    /** Bumped on sign-out, password change and disabling: every older JWT stops working. */
    tokenVersion: int('token_version').notNull().default(0),
    /**
     * `service`: the account of an integration, which signs in with an API token only (no
     * password, no mail); listed on the API tokens screen, not among the people.
     */
    kind: mysqlEnum('kind', ['person', 'service']).notNull().default('person'),
    /**
     * How the user reads velocity and displacement (screens, CSV exports, their e-mails):
     * `metric` mm/s and µm, `imperial` in/s and mil. Values stay stored in metric.
     */
    unitSystem: mysqlEnum('unit_system', ['metric', 'imperial']).notNull().default('metric'),
    disabledAt: at('disabled_at'),
    lastSignInAt: at('last_sign_in_at'),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('users_email_uq').on(t.email)],
);

export const userSites = mysqlTable(
  'user_sites',
  {
    userId: ref('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    siteId: ref('site_id')
      .notNull()
      .references(() => sites.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.userId, t.siteId] }), index('user_sites_site_idx').on(t.siteId)],
);

/** Single-use links: invitations and password resets. Only a hash of the token is kept. */
export const userTokens = mysqlTable(
  'user_tokens',
  {
    id: id(),
    userId: ref('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    purpose: mysqlEnum('purpose', ['invite', 'reset']).notNull(),
    tokenHash: varchar('token_hash', { length: 64 }).notNull(),
    expiresAt: at('expires_at').notNull(),
    usedAt: at('used_at'),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex('user_tokens_hash_uq').on(t.tokenHash)],
);

/**
 * API tokens of service accounts (one each): only the SHA-256 of the token is kept, with its
 * first characters to tell tokens apart on screen. Revoking sets `revoked_at`; a person
 * signing out ends nothing here.
 */
export const apiTokens = mysqlTable(
  'api_tokens',
  {
    id: id(),
    userId: ref('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    tokenPrefix: varchar('token_prefix', { length: 16 }).notNull(),
    tokenHash: varchar('token_hash', { length: 64 }).notNull(),
    createdBy: ref('created_by').references(() => users.id, { onDelete: 'set null' }),
    lastUsedAt: at('last_used_at'),
    revokedAt: at('revoked_at'),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('api_tokens_hash_uq').on(t.tokenHash),
    uniqueIndex('api_tokens_user_uq').on(t.userId),
  ],
);

/**
 * Answers to creating POSTs sent with an `Idempotency-Key`, per caller and key, until
 * `expires_at`: the same key with the same request gets the stored answer again. A row
 * without `status` is a request still running.
 */
export const idempotencyKeys = mysqlTable(
  'idempotency_keys',
  {
    id: bigId(),
    userId: ref('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    idemKey: varchar('idem_key', { length: 255 }).notNull(),
    /** SHA-256 of method, path and JSON body: what "the same request" means. */
    requestHash: varchar('request_hash', { length: 64 }).notNull(),
    status: smallint('status'),
    responseBody: text('response_body'),
    expiresAt: at('expires_at').notNull(),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('idempotency_keys_user_key_uq').on(t.userId, t.idemKey),
    index('idempotency_keys_expires_idx').on(t.expiresAt),
  ],
);

export const subscriptions = mysqlTable(
  'subscriptions',
  {
    id: id(),
    userId: ref('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    /** Scope: a whole site, or one machine. */
    siteId: ref('site_id').references(() => sites.id, { onDelete: 'cascade' }),
    machineId: ref('machine_id').references(() => machines.id, { onDelete: 'cascade' }),
    minLevel: mysqlEnum('min_level', ['alert', 'danger']).notNull().default('alert'),
    cadence: mysqlEnum('cadence', ['immediate', 'hourly']).notNull().default('immediate'),
    weeklyDigest: boolean('weekly_digest').notNull().default(false),
    createdAt: createdAt(),
  },
  (t) => [
    index('subscriptions_user_idx').on(t.userId),
    index('subscriptions_site_idx').on(t.siteId),
  ],
);

// ---------------------------------------------------------------- data in

export const gateways = mysqlTable(
  'gateways',
  {
    id: id(),
    siteId: ref('site_id')
      .notNull()
      .references(() => sites.id),
    name: varchar('name', { length: 200 }).notNull(),
    /** First characters of the key, for lookup and for display; never the key itself. */
    keyPrefix: varchar('key_prefix', { length: 16 }).notNull(),
    keyHash: varchar('key_hash', { length: 64 }).notNull(),
    revokedAt: at('revoked_at'),
    lastSeenAt: at('last_seen_at'),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('gateways_key_prefix_uq').on(t.keyPrefix),
    index('gateways_site_idx').on(t.siteId),
  ],
);

/**
 * The three tables a plant-year fills (snapshots, analyses, band_values) are partitioned by
 * month on `taken_at` (MariaDB RANGE COLUMNS; the migration 0018_time-partitioning creates the
 * partitions, the worker adds months ahead: features/worker/partitions.ts). Drizzle cannot
 * express partitions, so this file describes their columns and keys only. InnoDB partitioned
 * tables take no foreign keys, in or out, and every unique key holds the partition column:
 * their primary keys are (id, taken_at) with id still AUTO_INCREMENT, the rows that pointed at
 * them by foreign key (jobs, quality notices, pins) are kept in step by the product (point
 * deletion and retention's partition drop), and a snapshot's uid is unique per sender in
 * `snapshot_uids`.
 */
const partitionedId = () =>
  bigint('id', { mode: 'number', unsigned: true }).autoincrement().notNull();

export const snapshots = mysqlTable(
  'snapshots',
  {
    id: partitionedId(),
    uid: varchar('uid', { length: 128 }).notNull(),
    pointId: ref('point_id').notNull(),
    gatewayId: ref('gateway_id'),
    /**
     * Who the uid belongs to: the gateway, or 0 for uploads. A uid is unique per sender
     * (idempotency is the sender's), so one site's gateway cannot take another's uids.
     * (Never NULL; MariaDB does not allow NOT NULL on a generated column.)
     */
    senderId: int('sender_id').generatedAlwaysAs(sql`coalesce(\`gateway_id\`, 0)`, {
      mode: 'stored',
    }),
    source: mysqlEnum('source', ['gateway', 'upload']).notNull(),
    takenAt: at('taken_at').notNull(),
    receivedAt: at('received_at')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    sampleRateHz: double('sample_rate_hz').notNull(),
    sampleCount: int('sample_count').notNull(),
    encoding: mysqlEnum('encoding', encodingEnum).notNull(),
    adcBits: smallint('adc_bits').notNull(),
    fullScaleV: double('full_scale_v').notNull(),
    sensitivityMvPerG: double('sensitivity_mv_per_g').notNull(),
    speedRpm: double('speed_rpm'),
    tach: compressedJsonColumn<{ pulseTimesS: number[]; pulsesPerRev: number } | null>('tach'),
    /** Little-endian samples in `encoding`, coded by `samplesCodec`; null once expired by retention. */
    samples: mediumBlob('samples'),
    /**
     * How `samples` is stored: raw deflate, or the bytes as sent. Gateway-sized captures are
     * kept as sent (see the ingest service); rows written before the column are deflate.
     */
    samplesCodec: mysqlEnum('samples_codec', ['deflate-raw', 'none'])
      .notNull()
      .default('deflate-raw'),
    samplesExpiredAt: at('samples_expired_at'),
    contentHash: varchar('content_hash', { length: 64 }).notNull(),
    status: mysqlEnum('status', ['queued', 'done', 'rejected', 'failed'])
      .notNull()
      .default('queued'),
    statusReason: text('status_reason'),
    uploadedBy: ref('uploaded_by'),
    fileName: varchar('file_name', { length: 255 }),
  },
  (t) => [
    primaryKey({ columns: [t.id, t.takenAt] }),
    index('snapshots_point_taken_idx').on(t.pointId, t.takenAt),
    index('snapshots_status_idx').on(t.status),
    index('snapshots_received_idx').on(t.receivedAt),
  ],
);

/**
 * Who owns a snapshot's uid: unique per sender (a gateway, or 0 for uploads), so a repeat is
 * found and compared by content hash (ingest). Its own table because a unique key of the
 * partitioned `snapshots` would have to include `taken_at`.
 */
export const snapshotUids = mysqlTable(
  'snapshot_uids',
  {
    senderId: int('sender_id').notNull(),
    uid: varchar('uid', { length: 128 }).notNull(),
    snapshotId: bigRef('snapshot_id').notNull(),
  },
  (t) => [primaryKey({ columns: [t.senderId, t.uid] })],
);

export const jobs = mysqlTable(
  'jobs',
  {
    id: bigId(),
    kind: varchar('kind', { length: 32 }).notNull(),
    /** The snapshot to analyse (no foreign key: `snapshots` is partitioned). */
    snapshotId: bigRef('snapshot_id'),
    payload: jsonColumn<Record<string, unknown>>('payload'),
    state: mysqlEnum('state', ['queued', 'running', 'done', 'failed']).notNull().default('queued'),
    runAfter: at('run_after')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    attempts: int('attempts').notNull().default(0),
    maxAttempts: int('max_attempts').notNull().default(5),
    leaseOwner: varchar('lease_owner', { length: 64 }),
    leaseExpiresAt: at('lease_expires_at'),
    lastError: text('last_error'),
    createdAt: createdAt(),
    finishedAt: at('finished_at'),
  },
  (t) => [
    index('jobs_claim_idx').on(t.state, t.runAfter),
    index('jobs_lease_idx').on(t.state, t.leaseExpiresAt),
    index('jobs_snapshot_idx').on(t.snapshotId),
  ],
);

// ---------------------------------------------------------------- results

export const analyses = mysqlTable(
  'analyses',
  {
    id: partitionedId(),
    snapshotId: bigRef('snapshot_id').notNull(),
    pointId: ref('point_id').notNull(),
    /** The snapshot's `taken_at` (the partition column of both). */
    takenAt: at('taken_at').notNull(),
    accelRmsG: double('accel_rms_g').notNull(),
    accelPeakG: double('accel_peak_g').notNull(),
    velocityRmsMmS: double('velocity_rms_mm_s').notNull(),
    displacementPkPkUm: double('displacement_pkpk_um').notNull(),
    crestFactor: double('crest_factor').notNull(),
    kurtosis: double('kurtosis').notNull(),
    speedRpm: double('speed_rpm'),
    speedSource: mysqlEnum('speed_source', ['tach', 'rpm', 'estimated', 'none']).notNull(),
    isoZone: mysqlEnum('iso_zone', ['A', 'B', 'C', 'D']),
    qualityVerdict: mysqlEnum('quality_verdict', verdictEnum).notNull(),
    bitsUsed: double('bits_used'),
    qualityFindings: jsonColumn<unknown[]>('quality_findings').notNull(),
    /**
     * What every capture keeps for ever besides its scalars (record shape, overall-value
     * bands, speed); the detail a capture with spectra needs (axes, peaks, fault
     * frequencies) is stored in `spectra` (features/points/stored-summary.ts). Rows written
     * before hold that detail here too.
     */
    summary: compressedJsonColumn<Record<string, unknown>>('summary').notNull(),
    /**
     * All of the analysis's spectra in one BLOB: 16-bit log-amplitude codes, deflated
     * (`@turnstone/db/spectra-codec`, worst-case relative error 5.76e-4). Null on rows
     * written before it, whose spectra sit in the four float32 columns below.
     */
    spectra: mediumBlob('spectra'),
    /** Float32 spectra of rows written before `spectra`; no longer written. */
    accelSpectrum: mediumBlob('accel_spectrum'),
    velocitySpectrum: mediumBlob('velocity_spectrum'),
    envelopeSpectrum: mediumBlob('envelope_spectrum'),
    orderSpectrum: mediumBlob('order_spectrum'),
    /**
     * When the tiered retention pass cleared this capture's spectra (`spectra` and the four
     * float32 columns above); null while they are kept. Scalars, band values, summary and
     * diagnosis stay.
     */
    spectraThinnedAt: at('spectra_thinned_at'),
    /**
     * Diagnosis hints of the capture with their evidence, the notes, and the severity from
     * which 1×-family hints counted (`@turnstone/condition` diagnose); null for analyses
     * stored before hints were kept.
     */
    diagnosis: compressedJsonColumn<Record<string, unknown> | null>('diagnosis'),
    /** 1× and 2× vectors against the tach pulse (`@turnstone/dsp` shaftVectors); null without a tach. */
    shaftVectors: compressedJsonColumn<Record<string, unknown>[] | null>('shaft_vectors'),
    createdAt: createdAt(),
  },
  (t) => [
    primaryKey({ columns: [t.id, t.takenAt] }),
    uniqueIndex('analyses_snapshot_uq').on(t.snapshotId, t.takenAt),
    index('analyses_point_taken_idx').on(t.pointId, t.takenAt),
    /** The retention pass walks captures still holding spectra by id, not the whole table. */
    index('analyses_thinned_idx').on(t.spectraThinnedAt, t.id),
  ],
);

export const limitSets = mysqlTable(
  'limit_sets',
  {
    id: id(),
    /** A point's own set, or a machine-type template when pointId is null. */
    pointId: ref('point_id').references(() => points.id, { onDelete: 'cascade' }),
    machineType: mysqlEnum('machine_type', machineTypeEnum),
    name: varchar('name', { length: 200 }).notNull(),
    version: int('version').notNull().default(1),
    updatedBy: ref('updated_by').references(() => users.id),
    updatedAt: at('updated_at')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('limit_sets_point_uq').on(t.pointId),
    index('limit_sets_type_idx').on(t.machineType),
  ],
);

export const bands = mysqlTable(
  'bands',
  {
    id: id(),
    limitSetId: ref('limit_set_id')
      .notNull()
      .references(() => limitSets.id, { onDelete: 'cascade' }),
    /** Stable key within the set (e.g. "overall-velocity", "bpfo"); trends follow it. */
    key: varchar('key', { length: 64 }).notNull(),
    name: varchar('name', { length: 200 }).notNull(),
    kind: mysqlEnum('kind', ['overall', 'hz', 'order', 'fault']).notNull(),
    /** Which spectrum or overall value the band reads. */
    spectrum: mysqlEnum('spectrum', [
      'acceleration',
      'velocity',
      'displacement',
      'envelope',
    ]).notNull(),
    unit: varchar('unit', { length: 16 }).notNull(),
    alertLevel: double('alert_level').notNull(),
    dangerLevel: double('danger_level').notNull(),
    /**
     * The whole band as `@turnstone/condition` defines it (range, measure, persistence,
     * hysteresis, statistical rule and its established baseline). The columns above copy
     * what lists and queries need.
     */
    definition: jsonColumn<Record<string, unknown>>('definition').notNull(),
    sortOrder: smallint('sort_order').notNull().default(0),
  },
  (t) => [uniqueIndex('bands_set_key_uq').on(t.limitSetId, t.key)],
);

/** The condition state of a point (persistence counters and open alerts per band), as `@turnstone/condition` keeps it. */
export const pointStates = mysqlTable('point_states', {
  pointId: ref('point_id')
    .primaryKey()
    .references(() => points.id, { onDelete: 'cascade' }),
  state: jsonColumn<Record<string, unknown>>('state').notNull(),
  /** takenAt of the last capture evaluated; older captures arriving late are trended, not evaluated. */
  evaluatedTakenAt: at('evaluated_taken_at'),
  limitSetVersion: int('limit_set_version').notNull().default(0),
  updatedAt: at('updated_at').notNull(),
});

export const bandValues = mysqlTable(
  'band_values',
  {
    id: partitionedId(),
    analysisId: bigRef('analysis_id').notNull(),
    pointId: ref('point_id').notNull(),
    bandKey: varchar('band_key', { length: 64 }).notNull(),
    takenAt: at('taken_at').notNull(),
    value: double('value').notNull(),
    qualityVerdict: mysqlEnum('quality_verdict', verdictEnum).notNull(),
  },
  (t) => [
    primaryKey({ columns: [t.id, t.takenAt] }),
    uniqueIndex('band_values_analysis_band_uq').on(t.analysisId, t.bandKey, t.takenAt),
    // Covering for the trend's projection window (time, value, quality of one band).
    index('band_values_trend_idx').on(t.pointId, t.bandKey, t.takenAt, t.value, t.qualityVerdict),
    // (band_values_point_time_idx, a covering index for the weekly review's daily means, was
    // dropped in 0021: band_day_sums serves those since 0019, and it was a fifth of the
    // table's bytes per capture.)
  ],
);

/**
 * Daily sums of each point's usable band values (verdict not `unusable`), by the local
 * calendar day of the point's site: kept in the analysis write transaction beside the band
 * values, rebuilt for a site whose time zone changes and for points that move site. The
 * weekly review reads its daily means here instead of grouping six weeks of band values
 * (review-repository dailyMeans; maintained by analysis/band-day-sums.ts).
 */
export const bandDaySums = mysqlTable(
  'band_day_sums',
  {
    pointId: ref('point_id')
      .notNull()
      .references(() => points.id, { onDelete: 'cascade' }),
    bandKey: varchar('band_key', { length: 64 }).notNull(),
    /** Local day of the site, YYYY-MM-DD. */
    day: date('day', { mode: 'string' }).notNull(),
    /** Values summed. */
    n: int('n').notNull(),
    sumValue: double('sum_value').notNull(),
    /** Sum of the values' capture times, epoch milliseconds. */
    sumTakenMs: double('sum_taken_ms').notNull(),
  },
  (t) => [primaryKey({ columns: [t.pointId, t.day, t.bandKey] })],
);

/**
 * Each point's band values summed by UTC hour: the count and sum, and the hour's lowest and
 * highest value with the capture they came from (the first in time order, then analysis id,
 * when values tie). The trend reads these instead of the raw values when its buckets are an
 * hour or wider (points/trend-values.ts), so a year is 8,760 rows a band, not 52,560. Kept
 * exactly: every write or deletion of band values recomputes the hours it touched from
 * `band_values` in the same transaction (analysis/band-hours-repository.ts); a dropped
 * month partition takes its hours with it. Hours are UTC whatever the site's zone.
 */
export const bandValueHours = mysqlTable(
  'band_value_hours',
  {
    pointId: ref('point_id')
      .notNull()
      .references(() => points.id, { onDelete: 'cascade' }),
    bandKey: varchar('band_key', { length: 64 }).notNull(),
    /** Start of the UTC hour. */
    hourAt: datetime('hour_at', { mode: 'date' }).notNull(),
    n: int('n').notNull(),
    sumValue: double('sum_value').notNull(),
    minValue: double('min_value').notNull(),
    minAt: at('min_at').notNull(),
    minAnalysisId: bigRef('min_analysis_id').notNull(),
    minQuality: mysqlEnum('min_quality', verdictEnum).notNull(),
    maxValue: double('max_value').notNull(),
    maxAt: at('max_at').notNull(),
    maxAnalysisId: bigRef('max_analysis_id').notNull(),
    maxQuality: mysqlEnum('max_quality', verdictEnum).notNull(),
  },
  (t) => [primaryKey({ columns: [t.pointId, t.bandKey, t.hourAt] })],
);

export const alerts = mysqlTable(
  'alerts',
  {
    id: id(),
    pointId: ref('point_id')
      .notNull()
      .references(() => points.id),
    bandKey: varchar('band_key', { length: 64 }).notNull(),
    bandName: varchar('band_name', { length: 200 }).notNull(),
    level: mysqlEnum('level', ['alert', 'danger']).notNull(),
    state: mysqlEnum('state', ['raised', 'acknowledged', 'cleared']).notNull(),
    unit: varchar('unit', { length: 16 }).notNull(),
    limitValue: double('limit_value').notNull(),
    firstValue: double('first_value').notNull(),
    lastValue: double('last_value').notNull(),
    peakValue: double('peak_value').notNull(),
    firstAt: at('first_at').notNull(),
    lastAt: at('last_at').notNull(),
    peakAt: at('peak_at').notNull(),
    /** True when the value that raised it came from a `suspect` capture. */
    suspect: boolean('suspect').notNull().default(false),
    acknowledgedBy: ref('acknowledged_by').references(() => users.id),
    acknowledgedAt: at('acknowledged_at'),
    acknowledgeNote: text('acknowledge_note'),
    clearedAt: at('cleared_at'),
    createdAt: createdAt(),
    /** Last change (raised, new value, escalated, acknowledged, cleared); rows older than the column: when it came. */
    updatedAt: at('updated_at')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [
    index('alerts_state_idx').on(t.state, t.lastAt),
    index('alerts_updated_idx').on(t.updatedAt, t.id),
    index('alerts_point_idx').on(t.pointId, t.bandKey, t.state),
  ],
);

/** Every state change of an alert: the alert's history. */
export const alertEvents = mysqlTable(
  'alert_events',
  {
    id: bigId(),
    alertId: ref('alert_id')
      .notNull()
      .references(() => alerts.id, { onDelete: 'cascade' }),
    kind: mysqlEnum('kind', ['raised', 'escalated', 'acknowledged', 'cleared']).notNull(),
    level: mysqlEnum('level', ['alert', 'danger']).notNull(),
    value: double('value'),
    userId: ref('user_id').references(() => users.id),
    note: text('note'),
    at: at('at').notNull(),
  },
  (t) => [index('alert_events_alert_idx').on(t.alertId, t.at)],
);

/** A capture judged `unusable` (or `suspect`) is told to the engineer here, not as an alarm. */
export const qualityNotices = mysqlTable(
  'quality_notices',
  {
    id: id(),
    pointId: ref('point_id')
      .notNull()
      .references(() => points.id),
    /** No foreign keys to the partitioned captures' tables: kept in step by the product. */
    analysisId: bigRef('analysis_id'),
    snapshotId: bigRef('snapshot_id'),
    verdict: mysqlEnum('verdict', verdictEnum).notNull(),
    findings: jsonColumn<unknown[]>('findings').notNull(),
    takenAt: at('taken_at').notNull(),
    reviewedBy: ref('reviewed_by').references(() => users.id),
    reviewedAt: at('reviewed_at'),
    createdAt: createdAt(),
  },
  (t) => [
    index('quality_notices_point_idx').on(t.pointId, t.takenAt),
    index('quality_notices_open_idx').on(t.reviewedAt),
    index('quality_notices_analysis_idx').on(t.analysisId),
    index('quality_notices_snapshot_idx').on(t.snapshotId),
  ],
);

/**
 * Captures a person pinned: kept whole (spectra and raw waveform) whatever their age, like
 * the captures around alert events (apps/server/src/features/worker/retention.ts).
 */
export const capturePins = mysqlTable('capture_pins', {
  /** No foreign key (`analyses` is partitioned); point deletion removes pins with the captures. */
  analysisId: bigRef('analysis_id').primaryKey(),
  pinnedBy: ref('pinned_by')
    .notNull()
    .references(() => users.id),
  pinnedAt: at('pinned_at').notNull(),
  note: varchar('note', { length: 200 }).notNull().default(''),
});

/** The planner's follow-ups. */
export const findings = mysqlTable(
  'findings',
  {
    id: id(),
    pointId: ref('point_id')
      .notNull()
      .references(() => points.id),
    alertId: ref('alert_id').references(() => alerts.id, { onDelete: 'set null' }),
    bandKey: varchar('band_key', { length: 64 }),
    title: varchar('title', { length: 200 }).notNull(),
    workOrderRef: varchar('work_order_ref', { length: 64 }),
    dueDate: date('due_date', { mode: 'string' }),
    state: mysqlEnum('state', ['open', 'planned', 'done']).notNull().default('open'),
    priority: mysqlEnum('priority', ['low', 'medium', 'high']).notNull().default('medium'),
    /** Who carries it out: a person or a crew, as the plant names them. */
    owner: varchar('owner', { length: 100 }),
    /** Machine downtime the work needs, hours; null when none is planned or known. */
    plannedDowntimeHours: double('planned_downtime_hours'),
    note: text('note'),
    createdBy: ref('created_by')
      .notNull()
      .references(() => users.id),
    createdAt: createdAt(),
    /** Last change (creation, or any field written); rows older than the column: when it came. */
    updatedAt: at('updated_at')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [
    index('findings_point_idx').on(t.pointId),
    index('findings_state_idx').on(t.state, t.dueDate),
  ],
);

// ---------------------------------------------------------------- records and mail

export const auditLog = mysqlTable(
  'audit_log',
  {
    id: bigId(),
    actorUserId: ref('actor_user_id').references(() => users.id),
    action: varchar('action', { length: 64 }).notNull(),
    entity: varchar('entity', { length: 32 }).notNull(),
    entityId: varchar('entity_id', { length: 64 }).notNull(),
    before: jsonColumn<unknown>('before'),
    after: jsonColumn<unknown>('after'),
    reason: text('reason'),
    at: at('at')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    /**
     * The site the entry concerns, fixed when it is written (so it outlives a deleted
     * machine or point); null for what belongs to no site (users, machine-type templates).
     * No foreign key: the record stays when a site goes.
     */
    siteId: int('site_id'),
  },
  (t) => [
    index('audit_entity_idx').on(t.entity, t.entityId),
    index('audit_at_idx').on(t.at),
    index('audit_site_idx').on(t.siteId, t.id),
  ],
);

export const outbox = mysqlTable(
  'outbox',
  {
    id: bigId(),
    kind: varchar('kind', { length: 32 }).notNull(),
    /** Makes "one message per user per event" a database rule, not a hope. */
    dedupeKey: varchar('dedupe_key', { length: 191 }).notNull(),
    toAddress: varchar('to_address', { length: 254 }).notNull(),
    subject: varchar('subject', { length: 300 }).notNull(),
    textBody: text('text_body').notNull(),
    htmlBody: text('html_body'),
    attempts: int('attempts').notNull().default(0),
    nextAttemptAt: at('next_attempt_at')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    leaseOwner: varchar('lease_owner', { length: 64 }),
    leaseExpiresAt: at('lease_expires_at'),
    sendingStartedAt: at('sending_started_at'),
    sentAt: at('sent_at'),
    lastError: text('last_error'),
    /**
     * Final outcome: null while the row may still be sent; `sent`; `failed` after the last
     * attempt; `uncertain` when a send started, its worker died and the relay cannot be
     * asked whether it arrived (the row is not sent again, so nobody gets it twice).
     */
    outcome: mysqlEnum('outcome', ['sent', 'failed', 'uncertain']),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('outbox_dedupe_uq').on(t.dedupeKey),
    index('outbox_due_idx').on(t.sentAt, t.nextAttemptAt),
  ],
);

/** Outgoing webhooks: where alert and finding events are posted, signed with `secret`. */
export const webhooks = mysqlTable('webhooks', {
  id: id(),
  name: varchar('name', { length: 200 }).notNull(),
  url: varchar('url', { length: 2000 }).notNull(),
  /** The HMAC-SHA256 key (base64); needed in clear to sign, shown to the admin once. */
  secret: varchar('secret', { length: 100 }).notNull(),
  /** Event types it receives (`alert.raised`, `finding.created`…). */
  events: jsonColumn<string[]>('events').notNull(),
  enabled: boolean('enabled').notNull().default(true),
  createdBy: ref('created_by').references(() => users.id, { onDelete: 'set null' }),
  createdAt: createdAt(),
  updatedAt: at('updated_at')
    .notNull()
    .default(sql`CURRENT_TIMESTAMP(3)`),
});

/**
 * One event for one webhook: an outbox row (written in the transaction of the change, sent
 * under a lease, with the mail outbox's rule that nothing is delivered twice).
 */
export const webhookDeliveries = mysqlTable(
  'webhook_deliveries',
  {
    id: bigId(),
    webhookId: ref('webhook_id')
      .notNull()
      .references(() => webhooks.id, { onDelete: 'cascade' }),
    /** The event's id, the same in every delivery attempt (`webhook-id` header). */
    eventId: varchar('event_id', { length: 64 }).notNull(),
    eventType: varchar('event_type', { length: 64 }).notNull(),
    body: text('body').notNull(),
    attempts: int('attempts').notNull().default(0),
    nextAttemptAt: at('next_attempt_at')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
    leaseOwner: varchar('lease_owner', { length: 64 }),
    leaseExpiresAt: at('lease_expires_at'),
    sendingStartedAt: at('sending_started_at'),
    sentAt: at('sent_at'),
    lastStatus: smallint('last_status'),
    lastError: text('last_error'),
    outcome: mysqlEnum('outcome', ['sent', 'failed', 'uncertain']),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex('webhook_deliveries_event_uq').on(t.webhookId, t.eventId),
    index('webhook_deliveries_due_idx').on(t.sentAt, t.nextAttemptAt),
  ],
);

/** What the local SMTP fake received (the Mailbox screen); empty when a real relay is used. */
export const mailMessages = mysqlTable(
  'mail_messages',
  {
    id: bigId(),
    /** The Message-ID header: how the outbox sender asks whether a message already arrived. */
    messageId: varchar('message_id', { length: 255 }),
    mailFrom: varchar('mail_from', { length: 320 }).notNull(),
    /** Envelope recipients, comma-separated. */
    mailTo: text('mail_to').notNull(),
    subject: varchar('subject', { length: 500 }).notNull(),
    headers: jsonColumn<Record<string, string>>('headers').notNull(),
    textBody: text('text_body'),
    htmlBody: text('html_body'),
    receivedAt: at('received_at')
      .notNull()
      .default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [
    index('mail_messages_message_id_idx').on(t.messageId),
    index('mail_messages_received_idx').on(t.receivedAt),
  ],
);

/** Installation settings (mail sender, retention days, digest schedule). */
export const settings = mysqlTable('settings', {
  key: varchar('key', { length: 64 }).primaryKey(),
  value: jsonColumn<unknown>('value').notNull(),
  updatedAt: at('updated_at').notNull(),
});
