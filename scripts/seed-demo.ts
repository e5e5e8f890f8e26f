/**
 * The demo firm: an invented consultancy with one user per role, a few client projects and a
 * parts library of invented generic parts. Everything here is made up for the demo; nothing
 * names a real firm, person or part.
 */
import { eq } from "drizzle-orm";
import { write, read } from "../db/write";
import { memberships, parts, projectAccess, projects, users, workspaces } from "../db/schema";
import { hashPassword } from "../lib/auth/password";
import { newId } from "../lib/ids";
import { trialFields } from "../lib/billing/trial";
import { DEMO_OPAMPS, DEMO_REFERENCES } from "../lib/calc/core/demo-parts";

export const DEMO_SLUG = "fenwick-lane";
export const DEMO_PASSWORD = "loopwright-demo";

export const DEMO_PEOPLE = [
  { key: "owner", role: "owner", name: "Ada Marlowe", email: "owner@fenwick-lane.test" },
  { key: "engineer", role: "engineer", name: "Tomas Reyes", email: "engineer@fenwick-lane.test" },
  { key: "checker", role: "checker", name: "Ines Kallio", email: "checker@fenwick-lane.test" },
  { key: "client", role: "client", name: "Rowan Pike", email: "client@northmoor.test" },
] as const;

export interface DemoLogin {
  role: string;
  name: string;
  email: string;
  password: string;
}

export async function seedDemo(): Promise<DemoLogin[]> {
  const logins: DemoLogin[] = DEMO_PEOPLE.map((p) => ({ role: p.role, name: p.name, email: p.email, password: DEMO_PASSWORD }));
  const db = await read();
  const existing = await db.query.workspaces.findFirst({ where: eq(workspaces.slug, DEMO_SLUG) });
  if (existing) return logins;

  const now = Date.now();
  const hash = await hashPassword(DEMO_PASSWORD);
  const wsId = newId();
  const ids = Object.fromEntries(DEMO_PEOPLE.map((p) => [p.key, newId()])) as Record<(typeof DEMO_PEOPLE)[number]["key"], string>;
  const projectRows = [
    { id: newId(), name: "Strain-gauge bridge front end", clientName: "Northmoor Instruments", jobNumber: "NMI-2207", description: "Bridge amplifier, anti-alias filter and ADC reference for a 24-bit load-cell module on 5 V." },
    { id: newId(), name: "Balanced line driver", clientName: "Calder Acoustics", jobNumber: "CA-118", description: "±15 V line driver and output stage for a studio monitor controller." },
    { id: newId(), name: "Battery monitor reference", clientName: "Northmoor Instruments", jobNumber: "NMI-2231", description: "Shunt reference and divider for a 3.3 V battery monitor." },
  ];
  await write(async (w) => {
    await w.batch([
      w.insert(workspaces).values({ id: wsId, name: "Fenwick Lane Analog", slug: DEMO_SLUG, createdAt: now, ...trialFields(now) }),
      ...DEMO_PEOPLE.map((p) => w.insert(users).values({ id: ids[p.key], email: p.email, name: p.name, passwordHash: hash, createdAt: now })),
      ...DEMO_PEOPLE.map((p) => w.insert(memberships).values({ id: newId(), workspaceId: wsId, userId: ids[p.key], role: p.role, createdAt: now })),
      ...projectRows.map((p) => w.insert(projects).values({ ...p, workspaceId: wsId, createdBy: ids.owner, createdAt: now, updatedAt: now })),
      ...projectRows
        .filter((p) => p.clientName === "Northmoor Instruments")
        .map((p) => w.insert(projectAccess).values({ projectId: p.id, userId: ids.client, workspaceId: wsId, createdAt: now })),
      // The parts library: the invented demo parts (lib/calc/core/demo-parts.ts), SI units.
      w.insert(parts).values(
        [...DEMO_OPAMPS.map((p) => ["opamp", p] as const), ...DEMO_REFERENCES.map((p) => ["reference", p] as const)].map(([kind, p]) => {
          const { name, ...params } = p as unknown as { name: string } & Record<string, number | string>;
          return { id: newId(), workspaceId: wsId, kind, name, params, notes: "Demo part with invented values.", createdBy: ids.owner, createdAt: now, updatedAt: now };
        }),
      ),
    ]);
  });
  await seedCalculations(wsId, ids, projectRows.map((p) => p.id));
  return logins;
}

type PersonKey = (typeof DEMO_PEOPLE)[number]["key"];

/**
 * A few calculations in every state of the workflow, made through the same functions the
 * route handlers call: drafts, one returned with a comment, one in check, one approved, and
 * issued ones with signed reports (one of them superseded by a revision B in progress).
 */
async function seedCalculations(wsId: string, ids: Record<PersonKey, string>, [bridge, lineDriver, battery]: string[]): Promise<void> {
  const { createCalculation, saveCalculation, getCalculationRow } = await import("../lib/calculations");
  const { transition } = await import("../lib/calculations/workflow");
  const { issueReport } = await import("../lib/reports/issue");
  const db = await read();
  const ws = (await db.query.workspaces.findFirst({ where: eq(workspaces.id, wsId) }))!;
  const ctxs = {} as Record<PersonKey, { user: NonNullable<Awaited<ReturnType<typeof db.query.users.findFirst>>>; workspace: typeof ws; role: (typeof DEMO_PEOPLE)[number]["role"] }>;
  for (const p of DEMO_PEOPLE) ctxs[p.key] = { user: (await db.query.users.findFirst({ where: eq(users.id, ids[p.key]) }))!, workspace: ws, role: p.role };
  const library = await db.select().from(parts).where(eq(parts.workspaceId, wsId));

  /** The type's defaults, with its part taken from the library (so the report names the source). */
  async function create(who: PersonKey, projectId: string, typeId: string, title: string) {
    const c = await createCalculation(ctxs[who], projectId, { typeId, title });
    const inputs = structuredClone(c.inputs) as Record<string, unknown>;
    for (const [k, v] of Object.entries(inputs)) {
      const part = v && typeof v === "object" && "values" in v ? library.find((l) => l.name === (v as unknown as { name: string }).name) : undefined;
      if (part) inputs[k] = { partId: part.id, name: part.name, values: { ...part.params } };
    }
    const saved = await saveCalculation(ctxs[who], c.id, { version: c.version, inputs });
    return saved;
  }
  const version = async (id: string) => (await getCalculationRow(ctxs.owner, id)).version;
  const go = async (who: PersonKey, id: string, body: Record<string, unknown>) =>
    transition(ctxs[who], id, { version: await version(id), ...body } as Parameters<typeof transition>[2]);
  const approveFlow = async (id: string) => {
    await go("engineer", id, { action: "submit", checkerId: ids.checker });
    await go("checker", id, { action: "approve", comment: "Checked against the sensor data sheet and the board's supply tolerances." });
  };

  // Strain-gauge front end: an issued gain stage, a filter in check, a draft error budget.
  const gain = await create("engineer", bridge, "amplifier.gain-stage", "Bridge amplifier gain stage");
  await approveFlow(gain.id);
  await issueReport(ctxs.owner, gain.id, { version: await version(gain.id) });
  const aaf = await create("engineer", bridge, "filter.lowpass", "Anti-alias low-pass ahead of the ADC");
  await go("engineer", aaf.id, { action: "submit", checkerId: ids.checker });
  await create("engineer", bridge, "reference.adc-budget", "ADC reference error budget");

  // Line driver: an approved output stage waiting to be issued; a difference receiver returned.
  const out = await create("engineer", lineDriver, "amplifier.power-stage", "Output stage dissipation and heatsink");
  await approveFlow(out.id);
  const diff = await create("engineer", lineDriver, "amplifier.difference", "Balanced input receiver");
  await go("engineer", diff.id, { action: "submit", checkerId: ids.checker });
  await go("checker", diff.id, { action: "return", comment: "State the source impedance of the console outputs and use 0.1 % resistors in the CMRR case." });

  // Battery monitor: revision A issued, revision B started (A is superseded and stays downloadable).
  const shunt = await create("engineer", battery, "reference.shunt", "Shunt reference bias resistor");
  await approveFlow(shunt.id);
  await issueReport(ctxs.owner, shunt.id, { version: await version(shunt.id) });
  await go("engineer", shunt.id, { action: "revise", comment: "Supply range widened to 3.0–4.4 V after the battery change." });
  await create("engineer", battery, "filter.bandpass", "Pilot-tone band-pass");
}
