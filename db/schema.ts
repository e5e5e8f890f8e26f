/**
 * The whole database schema: tables first, then relations, then row types.
 *
 * Conventions: ids are random text (crypto.randomUUID()); times are integer milliseconds since
 * the epoch (`at` columns); JSON is stored as text with Drizzle's json mode; every table that
 * belongs to a workspace carries workspace_id so every query can be scoped by it.
 */
import { relations, sql } from "drizzle-orm";
import { blob, index, integer, primaryKey, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";

export const ROLES = ["owner", "engineer", "checker", "client"] as const;
export type Role = (typeof ROLES)[number];

export const CALC_STATUSES = ["draft", "in_check", "approved", "issued"] as const;
export type CalcStatus = (typeof CALC_STATUSES)[number];

export const SUBSCRIPTION_STATUSES = ["none", "trialing", "active", "past_due", "canceled", "incomplete", "unpaid"] as const;
export type SubscriptionStatus = (typeof SUBSCRIPTION_STATUSES)[number];

const now = sql`(cast(unixepoch('subsec') * 1000 as integer))`;

// --- identity --------------------------------------------------------------------------------

export const users = sqliteTable("users", {
  id: text("id").primaryKey(),
  email: text("email").notNull().unique(), // stored lower-case
  name: text("name").notNull(),
  passwordHash: text("password_hash"), // null: magic-link only
  /** Bumped on password change and "sign out everywhere"; tokens with an older one are refused. */
  sessionVersion: integer("session_version").notNull().default(1),
  createdAt: integer("created_at").notNull().default(now),
});

/** Single-use sign-in links sent by e-mail. Only the SHA-256 of the token is stored. */
export const loginTokens = sqliteTable("login_tokens", {
  id: text("id").primaryKey(),
  email: text("email").notNull(),
  tokenHash: text("token_hash").notNull().unique(),
  expiresAt: integer("expires_at").notNull(),
  usedAt: integer("used_at"),
  createdAt: integer("created_at").notNull().default(now),
});

/** Fixed-window counters for rate limits (sign-in, verify). Shared by every app process. */
export const rateLimits = sqliteTable("rate_limits", {
  key: text("key").primaryKey(),
  windowStart: integer("window_start").notNull(),
  count: integer("count").notNull(),
});

// --- workspaces ------------------------------------------------------------------------------

export const workspaces = sqliteTable("workspaces", {
  id: text("id").primaryKey(),
  name: text("name").notNull(),
  slug: text("slug").notNull().unique(),
  createdAt: integer("created_at").notNull().default(now),
  // Billing: the workspace is the paying entity.
  stripeCustomerId: text("stripe_customer_id").unique(),
  stripeSubscriptionId: text("stripe_subscription_id").unique(),
  subscriptionStatus: text("subscription_status", { enum: SUBSCRIPTION_STATUSES }).notNull().default("none"),
  /** Packs the subscription (or trial) unlocks: JSON array of pack ids. */
  packs: text("packs", { mode: "json" }).$type<string[]>().notNull().default(sql`'[]'`),
  seatsPaid: integer("seats_paid").notNull().default(0),
  trialEndsAt: integer("trial_ends_at"),
  currentPeriodEnd: integer("current_period_end"),
  cancelAtPeriodEnd: integer("cancel_at_period_end", { mode: "boolean" }).notNull().default(false),
  pastDueSince: integer("past_due_since"),
  /** `created` (ms) of the last Stripe event applied to the subscription: older ones are ignored. */
  subscriptionWatermark: integer("subscription_watermark").notNull().default(0),
});

export const memberships = sqliteTable(
  "memberships",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    userId: text("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: ROLES }).notNull(),
    createdAt: integer("created_at").notNull().default(now),
  },
  (t) => [uniqueIndex("memberships_workspace_user").on(t.workspaceId, t.userId), index("memberships_user").on(t.userId)],
);

export const invitations = sqliteTable(
  "invitations",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: text("role", { enum: ROLES }).notNull(),
    /** For client invitations: the projects the client will see (JSON array of project ids). */
    projectIds: text("project_ids", { mode: "json" }).$type<string[]>().notNull().default(sql`'[]'`),
    tokenHash: text("token_hash").notNull().unique(),
    invitedBy: text("invited_by").notNull().references(() => users.id),
    createdAt: integer("created_at").notNull().default(now),
    expiresAt: integer("expires_at").notNull(),
    acceptedAt: integer("accepted_at"),
    acceptedBy: text("accepted_by").references(() => users.id),
    revokedAt: integer("revoked_at"),
  },
  (t) => [index("invitations_workspace").on(t.workspaceId)],
);

export const projects = sqliteTable(
  "projects",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    clientName: text("client_name").notNull().default(""),
    jobNumber: text("job_number").notNull().default(""),
    description: text("description").notNull().default(""),
    archivedAt: integer("archived_at"),
    createdBy: text("created_by").notNull().references(() => users.id),
    createdAt: integer("created_at").notNull().default(now),
    updatedAt: integer("updated_at").notNull().default(now),
  },
  (t) => [index("projects_workspace").on(t.workspaceId)],
);

/** Which client members may see which projects. */
export const projectAccess = sqliteTable(
  "project_access",
  {
    projectId: text("project_id").notNull().references(() => projects.id, { onDelete: "cascade" }),
    userId: text("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    createdAt: integer("created_at").notNull().default(now),
  },
  (t) => [primaryKey({ columns: [t.projectId, t.userId] }), index("project_access_user").on(t.userId)],
);

export const auditEvents = sqliteTable(
  "audit_events",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    actorId: text("actor_id").references(() => users.id),
    /** Dotted verb, e.g. "member.invited", "calculation.approved". */
    action: text("action").notNull(),
    targetType: text("target_type").notNull(),
    targetId: text("target_id").notNull(),
    data: text("data", { mode: "json" }).$type<Record<string, unknown>>().notNull().default(sql`'{}'`),
    at: integer("at").notNull().default(now),
  },
  (t) => [index("audit_workspace_at").on(t.workspaceId, t.at), index("audit_target").on(t.targetType, t.targetId)],
);

// --- calculations ----------------------------------------------------------------------------

/** The parts library of a workspace: op-amps and references with their parameter sets (SI). */
export const parts = sqliteTable(
  "parts",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: ["opamp", "reference"] }).notNull(),
    name: text("name").notNull(),
    /** Parameters as validated by opAmpParamsSchema / referenceParamsSchema (without name). */
    params: text("params", { mode: "json" }).$type<Record<string, number | string>>().notNull(),
    notes: text("notes").notNull().default(""),
    createdBy: text("created_by").references(() => users.id),
    createdAt: integer("created_at").notNull().default(now),
    updatedAt: integer("updated_at").notNull().default(now),
  },
  (t) => [uniqueIndex("parts_workspace_kind_name").on(t.workspaceId, t.kind, t.name)],
);

/**
 * One calculation, in its current state. The current revision is `revision` ("A", "B", …);
 * every saved change is also kept in calculation_history, and every issued revision in reports.
 */
export const calculations = sqliteTable(
  "calculations",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    projectId: text("project_id").notNull().references(() => projects.id, { onDelete: "cascade" }),
    /** Firm's calculation number within the project, e.g. "C-014". */
    number: text("number").notNull(),
    title: text("title").notNull(),
    typeId: text("type_id").notNull(),
    engineVersion: text("engine_version").notNull(),
    status: text("status", { enum: CALC_STATUSES }).notNull().default("draft"),
    revision: text("revision").notNull().default("A"),
    /** Raw inputs as typed (RawInputs), kept even when they do not parse. */
    inputs: text("inputs", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    /** Snapshot of the last successful compute (CalcOutput), or null. */
    results: text("results", { mode: "json" }).$type<Record<string, unknown> | null>(),
    /** Pass / warning / fail counts of the snapshot, for the register. */
    checkSummary: text("check_summary", { mode: "json" }).$type<{ pass: number; warning: number; fail: number } | null>(),
    preparedBy: text("prepared_by").notNull().references(() => users.id),
    checkerId: text("checker_id").references(() => users.id),
    approvedBy: text("approved_by").references(() => users.id),
    submittedAt: integer("submitted_at"),
    approvedAt: integer("approved_at"),
    issuedAt: integer("issued_at"),
    /** Optimistic concurrency: a save must name the version it was based on. */
    version: integer("version").notNull().default(1),
    createdAt: integer("created_at").notNull().default(now),
    updatedAt: integer("updated_at").notNull().default(now),
    updatedBy: text("updated_by").references(() => users.id),
  },
  (t) => [
    uniqueIndex("calculations_project_number").on(t.projectId, t.number),
    index("calculations_workspace").on(t.workspaceId),
    index("calculations_project_updated").on(t.projectId, t.updatedAt),
  ],
);

/** Immutable history: one row per saved change or state transition of a calculation. */
export const calculationHistory = sqliteTable(
  "calculation_history",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    calculationId: text("calculation_id").notNull().references(() => calculations.id, { onDelete: "cascade" }),
    revision: text("revision").notNull(),
    version: integer("version").notNull(),
    /** "save", "submit", "return", "approve", "issue", "revise". */
    event: text("event").notNull(),
    status: text("status", { enum: CALC_STATUSES }).notNull(),
    title: text("title").notNull(),
    inputs: text("inputs", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    results: text("results", { mode: "json" }).$type<Record<string, unknown> | null>(),
    engineVersion: text("engine_version").notNull(),
    actorId: text("actor_id").notNull().references(() => users.id),
    at: integer("at").notNull().default(now),
  },
  (t) => [index("history_calculation").on(t.calculationId, t.version)],
);

export const reviewComments = sqliteTable(
  "review_comments",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    calculationId: text("calculation_id").notNull().references(() => calculations.id, { onDelete: "cascade" }),
    revision: text("revision").notNull(),
    authorId: text("author_id").notNull().references(() => users.id),
    /** "return" (sent back with this comment), "comment" (plain note). */
    kind: text("kind", { enum: ["return", "comment"] }).notNull(),
    body: text("body").notNull(),
    at: integer("at").notNull().default(now),
  },
  (t) => [index("comments_calculation").on(t.calculationId)],
);

export const attachments = sqliteTable(
  "attachments",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    calculationId: text("calculation_id").notNull().references(() => calculations.id, { onDelete: "cascade" }),
    filename: text("filename").notNull(),
    /** Detected from the bytes, never from the name. */
    mime: text("mime").notNull(),
    size: integer("size").notNull(),
    sha256: text("sha256").notNull(),
    data: blob("data", { mode: "buffer" }).notNull(),
    uploadedBy: text("uploaded_by").notNull().references(() => users.id),
    at: integer("at").notNull().default(now),
  },
  (t) => [index("attachments_calculation").on(t.calculationId)],
);

// --- reports ---------------------------------------------------------------------------------

/** One issued revision of a calculation: the signed PDF, immutable once written. */
export const reports = sqliteTable(
  "reports",
  {
    id: text("id").primaryKey(),
    workspaceId: text("workspace_id").notNull().references(() => workspaces.id, { onDelete: "cascade" }),
    projectId: text("project_id").notNull().references(() => projects.id, { onDelete: "cascade" }),
    calculationId: text("calculation_id").notNull().references(() => calculations.id, { onDelete: "cascade" }),
    revision: text("revision").notNull(),
    /** Short verification code printed on the report, e.g. "LW-7K3Q-9XPA". */
    code: text("code").notNull().unique(),
    sha256: text("sha256").notNull().unique(),
    pdf: blob("pdf", { mode: "buffer" }).notNull(),
    /** The report model the PDF was rendered from (inputs, results, sign-off), for exports. */
    snapshot: text("snapshot", { mode: "json" }).$type<Record<string, unknown>>().notNull(),
    preparedByName: text("prepared_by_name").notNull(),
    checkedByName: text("checked_by_name").notNull(),
    approvedByName: text("approved_by_name").notNull(),
    issuedBy: text("issued_by").notNull().references(() => users.id),
    issuedAt: integer("issued_at").notNull(),
    supersededAt: integer("superseded_at"),
    supersededByRevision: text("superseded_by_revision"),
  },
  (t) => [uniqueIndex("reports_calculation_revision").on(t.calculationId, t.revision), index("reports_project").on(t.projectId)],
);

/** The workspace's signing identity: certificate and private key (encrypted with a server secret). */
export const signingIdentities = sqliteTable("signing_identities", {
  workspaceId: text("workspace_id").primaryKey().references(() => workspaces.id, { onDelete: "cascade" }),
  certificatePem: text("certificate_pem").notNull(),
  /** AES-256-GCM encrypted PKCS#8 private key PEM, key from HKDF-SHA256 of REPORT_KEY_SECRET:
   * base64(version "v1" | salt | iv | tag | ciphertext) — see lib/reports/signing.ts. */
  encryptedKey: text("encrypted_key").notNull(),
  fingerprint: text("fingerprint").notNull(),
  createdAt: integer("created_at").notNull().default(now),
});

// --- billing ---------------------------------------------------------------------------------

/** Stripe events already applied (at-least-once delivery: claim the id before applying). */
export const stripeEvents = sqliteTable("stripe_events", {
  id: text("id").primaryKey(),
  type: text("type").notNull(),
  /** The event's own `created`, ms. */
  createdAt: integer("created_at").notNull(),
  receivedAt: integer("received_at").notNull().default(now),
});

// --- relations -------------------------------------------------------------------------------

export const usersRelations = relations(users, ({ many }) => ({ memberships: many(memberships) }));
export const workspacesRelations = relations(workspaces, ({ many }) => ({
  memberships: many(memberships),
  projects: many(projects),
  parts: many(parts),
}));
export const membershipsRelations = relations(memberships, ({ one }) => ({
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
  workspace: one(workspaces, { fields: [memberships.workspaceId], references: [workspaces.id] }),
}));
export const projectsRelations = relations(projects, ({ one, many }) => ({
  workspace: one(workspaces, { fields: [projects.workspaceId], references: [workspaces.id] }),
  calculations: many(calculations),
  access: many(projectAccess),
}));
export const calculationsRelations = relations(calculations, ({ one, many }) => ({
  project: one(projects, { fields: [calculations.projectId], references: [projects.id] }),
  history: many(calculationHistory),
  comments: many(reviewComments),
  attachments: many(attachments),
  reports: many(reports),
}));

// --- row types -------------------------------------------------------------------------------

export type User = typeof users.$inferSelect;
export type Workspace = typeof workspaces.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
export type Invitation = typeof invitations.$inferSelect;
export type Project = typeof projects.$inferSelect;
export type AuditEvent = typeof auditEvents.$inferSelect;
export type Part = typeof parts.$inferSelect;
export type Calculation = typeof calculations.$inferSelect;
export type CalculationHistoryRow = typeof calculationHistory.$inferSelect;
export type ReviewComment = typeof reviewComments.$inferSelect;
export type Attachment = typeof attachments.$inferSelect;
export type Report = typeof reports.$inferSelect;
export type SigningIdentity = typeof signingIdentities.$inferSelect;
