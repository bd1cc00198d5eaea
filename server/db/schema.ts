// Every table of Mechweave. drizzle-kit generates the SQL in drizzle/ from this file.
import { sql } from "drizzle-orm";
import { bigserial, bigint, customType, index, integer, jsonb, pgEnum, pgTable, primaryKey, text, timestamp, uuid } from "drizzle-orm/pg-core";

const bytea = customType<{ data: Uint8Array; driverData: Buffer }>({
  dataType: () => "bytea",
  toDriver: (value) => Buffer.from(value),
  fromDriver: (value) => new Uint8Array(value),
});

export const roleEnum = pgEnum("member_role", ["editor", "viewer"]);

export const users = pgTable("users", {
  id: uuid("id").primaryKey().defaultRandom(),
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  /** Set once the owner of the address followed a link mailed to it; seats granted by address wait for it. */
  emailVerifiedAt: timestamp("email_verified_at", { withTimezone: true }),
  createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
});

/** Single-use, expiring links mailed to an account's address: verification and password reset. */
export const emailTokens = pgTable(
  "email_tokens",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    purpose: text("purpose", { enum: ["verify", "reset"] }).notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    /** The address the link went to: it verifies that address only. */
    email: text("email").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    usedAt: timestamp("used_at", { withTimezone: true }),
  },
  (t) => [index("email_tokens_user_idx").on(t.userId, t.purpose)],
);

export const sessions = pgTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: uuid("user_id").references(() => users.id, { onDelete: "cascade" }),
    data: jsonb("data").notNull().default(sql`'{}'::jsonb`),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

export const mechanisms = pgTable(
  "mechanisms",
  {
    id: text("id").primaryKey(),
    title: text("title").notNull(),
    summary: text("summary").notNull().default(""),
    source: text("source").notNull().default(""),
    ownerId: uuid("owner_id").notNull().references(() => users.id),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("mechanisms_owner_idx").on(t.ownerId)],
);

/** Editors and viewers; the owner is mechanisms.owner_id, so there is always exactly one. */
export const memberships = pgTable(
  "memberships",
  {
    mechanismId: text("mechanism_id").notNull().references(() => mechanisms.id, { onDelete: "cascade" }),
    userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    role: roleEnum("role").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.mechanismId, t.userId] }), index("memberships_user_idx").on(t.userId)],
);

/** Audit trail of who gave or took which role; kept when a mechanism is deleted. */
export const roleChanges = pgTable(
  "role_changes",
  {
    id: integer("id").primaryKey().generatedAlwaysAsIdentity(),
    mechanismId: text("mechanism_id").notNull(),
    actorId: uuid("actor_id").references(() => users.id, { onDelete: "set null" }),
    subjectId: uuid("subject_id").references(() => users.id, { onDelete: "set null" }),
    subjectEmail: text("subject_email").notNull(),
    action: text("action", { enum: ["grant", "change", "revoke", "transfer", "delete", "invite", "uninvite", "accept", "link", "unlink"] }).notNull(),
    fromRole: text("from_role"),
    toRole: text("to_role"),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("role_changes_mechanism_idx").on(t.mechanismId)],
);

/** Failed sign-ins, counted per (account, client address) and per address to slow down guessing. */
export const failedSignIns = pgTable(
  "failed_sign_ins",
  {
    id: integer("id").primaryKey().generatedAlwaysAsIdentity(),
    address: text("address").notNull(),
    email: text("email").notNull(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("failed_sign_ins_address_idx").on(t.address, t.at), index("failed_sign_ins_email_idx").on(t.email, t.address, t.at)],
);

/** Every accepted Yjs update of a mechanism's shared document, appended as it arrives. */
export const docUpdates = pgTable(
  "doc_updates",
  {
    id: bigserial("id", { mode: "number" }).primaryKey(),
    mechanismId: text("mechanism_id").notNull().references(() => mechanisms.id, { onDelete: "cascade" }),
    update: bytea("update").notNull(),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("doc_updates_mechanism_idx").on(t.mechanismId, t.id)],
);

/** The compacted document: all updates up to and including `throughUpdate` merged into one. */
export const docStates = pgTable("doc_states", {
  mechanismId: text("mechanism_id").primaryKey().references(() => mechanisms.id, { onDelete: "cascade" }),
  state: bytea("state").notNull(),
  throughUpdate: bigint("through_update", { mode: "number" }).notNull(),
  at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
});

/** Versions: automatic on structural change, named by editors, or made by a restore. */
export const snapshots = pgTable(
  "snapshots",
  {
    id: integer("id").primaryKey().generatedAlwaysAsIdentity(),
    mechanismId: text("mechanism_id").notNull().references(() => mechanisms.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: ["auto", "named", "restore"] }).notNull(),
    name: text("name"),
    source: text("source").notNull(),
    state: bytea("state").notNull(),
    /** Invariants at this version (species, complexes, deficiency…), for diffs without re-parsing. */
    summary: jsonb("summary").notNull(),
    authorId: uuid("author_id").references(() => users.id, { onDelete: "set null" }),
    at: timestamp("at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("snapshots_mechanism_idx").on(t.mechanismId, t.at)],
);

/** E-mail invitations: single use, expiring; only a hash of the link's token is stored. */
export const invitations = pgTable(
  "invitations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    mechanismId: text("mechanism_id").notNull().references(() => mechanisms.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: roleEnum("role").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    invitedBy: uuid("invited_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    acceptedBy: uuid("accepted_by").references(() => users.id, { onDelete: "set null" }),
    /** Accepted by an account whose address is not verified yet: granted when it is. */
    claimedBy: uuid("claimed_by").references(() => users.id, { onDelete: "set null" }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [index("invitations_mechanism_idx").on(t.mechanismId)],
);

/** Read-only links for a class or a reviewer; only a hash of the token is stored. */
export const viewLinks = pgTable(
  "view_links",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    mechanismId: text("mechanism_id").notNull().references(() => mechanisms.id, { onDelete: "cascade" }),
    tokenHash: text("token_hash").notNull().unique(),
    /** The token's last characters, so the owner can tell links apart. */
    hint: text("hint").notNull(),
    label: text("label").notNull().default(""),
    createdBy: uuid("created_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp("expires_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [index("view_links_mechanism_idx").on(t.mechanismId)],
);

/** Personal access tokens for the JSON API; shown once, stored hashed. */
export const apiTokens = pgTable(
  "api_tokens",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    hint: text("hint").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [index("api_tokens_user_idx").on(t.userId)],
);

/** Measured time courses uploaded to a mechanism as CSV (a `time` column and species columns). */
export const dataSets = pgTable(
  "data_sets",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    mechanismId: text("mechanism_id").notNull().references(() => mechanisms.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    csv: text("csv").notNull(),
    /** UTF-8 bytes of `csv`, checked against MAX_CSV_BYTES when uploaded. */
    bytes: integer("bytes").notNull(),
    uploadedBy: uuid("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index("data_sets_mechanism_idx").on(t.mechanismId, t.createdAt)],
);

/** Parameter estimations run on a mechanism: what was fitted to what, on which text, and the outcome. */
export const fits = pgTable(
  "fits",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    mechanismId: text("mechanism_id").notNull().references(() => mechanisms.id, { onDelete: "cascade" }),
    /** The newest version when the fit started (null before the first version), and the text it ran on. */
    snapshotId: integer("snapshot_id").references(() => snapshots.id, { onDelete: "set null" }),
    source: text("source").notNull(),
    ranBy: uuid("ran_by").references(() => users.id, { onDelete: "set null" }),
    /** Ids of stored data sets (names kept in `settings`, so a fit still reads after a data set is deleted). */
    dataSetIds: jsonb("data_set_ids").notNull(),
    settings: jsonb("settings").notNull(),
    status: text("status", { enum: ["running", "done", "failed"] }).notNull(),
    result: jsonb("result"),
    error: text("error"),
    createdAt: timestamp("created_at", { withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
  },
  (t) => [index("fits_mechanism_idx").on(t.mechanismId, t.createdAt)],
);
