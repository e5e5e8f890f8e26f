/** Projects: create, rename, archive and restore, with bad input refused and nothing changed. */
import { beforeAll, describe, expect, it } from "vitest";
import { call, makeWorld, setupDb } from "./helpers";
import * as projectsRoute from "@/app/api/w/[slug]/projects/route";
import * as projectRoute from "@/app/api/w/[slug]/projects/[projectId]/route";

beforeAll(setupDb);

const fields = (b: Record<string, unknown>) => (b.error as { fields?: Record<string, string> }).fields ?? {};

describe("projects", () => {
  it("refuses an empty and a 500-character name, naming the field, and creates nothing", async () => {
    const w = await makeWorld();
    const list = async () => (await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie })).body.projects as Array<{ name: string }>;
    const n = (await list()).length;
    const empty = await call(projectsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { name: "   " } });
    expect(empty.status).toBe(422);
    expect(fields(empty.body).name).toMatch(/must not be empty/);
    const long = await call(projectsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { name: "x".repeat(500) } });
    expect(long.status).toBe(422);
    expect(fields(long.body).name).toMatch(/at most 200/);
    const wrongType = await call(projectsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { name: 42 } });
    expect(wrongType.status).toBe(422);
    expect((await list()).length).toBe(n);
  });

  it("renames, archives (hidden by default) and restores a project", async () => {
    const w = await makeWorld();
    const made = await call(projectsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { name: "Preamp", clientName: "Example Client", jobNumber: "J-1" } });
    expect(made.status).toBe(201);
    const id = (made.body.project as { id: string }).id;
    const p = { slug: w.slug, projectId: id };
    const renamed = await call(projectRoute.PATCH, { params: p, cookie: w.checker.cookie, body: { name: "Preamp rev 2" } });
    expect((renamed.body.project as { name: string }).name).toBe("Preamp rev 2");
    const badRename = await call(projectRoute.PATCH, { params: p, cookie: w.checker.cookie, body: { name: "" } });
    expect(badRename.status).toBe(422);
    expect((await call(projectRoute.PATCH, { params: p, cookie: w.checker.cookie, body: {} })).status).toBe(422);
    expect((await call(projectRoute.PATCH, { params: p, cookie: w.checker.cookie, body: { archived: "yes" } })).status).toBe(422);
    expect((await call(projectRoute.GET, { params: p, cookie: w.owner.cookie })).body.project).toMatchObject({ name: "Preamp rev 2" });

    await call(projectRoute.PATCH, { params: p, cookie: w.owner.cookie, body: { archived: true } });
    const names = async (q = "") =>
      ((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie, url: `http://localhost:3999/api/x${q}` })).body.projects as Array<{ name: string }>).map((x) => x.name);
    expect(await names()).not.toContain("Preamp rev 2");
    expect(await names("?archived=include")).toContain("Preamp rev 2");
    expect((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie, url: "http://localhost:3999/api/x?archived=maybe" })).status).toBe(422);
    await call(projectRoute.PATCH, { params: p, cookie: w.owner.cookie, body: { archived: false } });
    expect(await names()).toContain("Preamp rev 2");
  });

  it("refuses changes while the workspace is read-only, but still shows its projects", async () => {
    const w = await makeWorld({ status: "canceled" });
    const r = await call(projectsRoute.POST, { params: { slug: w.slug }, cookie: w.owner.cookie, body: { name: "After cancel" } });
    expect(r.status).toBe(403);
    expect((r.body.error as { code: string }).code).toBe("read_only");
    expect((await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie })).status).toBe(200);
  });
});
