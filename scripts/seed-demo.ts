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
  return logins;
}
