/**
 * Reports as a firm and its client use them: an owner invites a checker and a client (for one
 * project); a calculation is prepared and approved through the workflow API; the checker issues
 * it from the sheet and downloads the signed PDF; anyone verifies it on /verify by code and by
 * upload (a changed file does not match); the client gets the mail, sees the issued report on
 * the project page (no calculations) and downloads it.
 */
import fs from "node:fs";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { firstLink, signUp, uniqueEmail, waitForMail } from "./support";

/** Invite someone from the Members page (a client for `project`) and accept in a new context. */
async function inviteAndJoin(browser: Browser, owner: Page, slug: string, who: { name: string; role: "checker" | "client"; project?: string }): Promise<{ page: Page; email: string }> {
  await owner.goto(`/w/${slug}/members`);
  const email = uniqueEmail(who.role);
  await owner.getByLabel("Role", { exact: true }).selectOption(who.role);
  if (who.project) await owner.getByLabel(who.project).check();
  await owner.getByLabel("E-mail", { exact: true }).fill(email);
  await owner.getByRole("button", { name: "Send invitation" }).click();
  await expect(owner.getByText(`Invitation e-mailed to ${email}.`)).toBeVisible();
  const mail = await waitForMail(email, /invited you/);
  const ctx = await browser.newContext({ viewport: { width: 1440, height: 1000 }, acceptDownloads: true });
  const page = await ctx.newPage();
  await page.goto(firstLink(mail));
  await page.getByLabel("Your name").fill(who.name);
  await page.getByLabel("Choose a password").fill(`${who.role} password 1`);
  await page.getByRole("button", { name: "Create account and join" }).click();
  await page.waitForURL(new RegExp(`/w/${slug}/projects$`));
  return { page, email };
}

test("issue an approved calculation, download the signed PDF, verify it by code and by upload; the client is told and downloads it", async ({ browser }, info) => {
  const ownerCtx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const owner = await ownerCtx.newPage();
  const slug = await signUp(owner, { name: "Ines Owner", email: uniqueEmail("owner"), password: "owner password 1", firm: "Brookfield Signal Works" });

  // A project, shared with the client below.
  const projectName = "Vibration sensor front end";
  await owner.goto(`/w/${slug}/projects`);
  await owner.getByLabel("Project name").fill(projectName);
  await owner.getByRole("button", { name: "Create project" }).click();
  const projectLink = owner.getByRole("link", { name: projectName });
  await expect(projectLink).toBeVisible();
  const projectUrl = (await projectLink.getAttribute("href"))!;
  const projectId = projectUrl.split("/").pop()!;

  const { page: checker } = await inviteAndJoin(browser, owner, slug, { name: "Chloe Checker", role: "checker" });
  const { page: client, email: clientEmail } = await inviteAndJoin(browser, owner, slug, { name: "Cyril Client", role: "client", project: projectName });

  // Prepared by the owner, checked and approved by the checker, through the workflow API.
  const created = await owner.request.post(`/api/w/${slug}/projects/${projectId}/calculations`, { data: { typeId: "filter.lowpass", title: "Sensor front end" } });
  expect(created.status()).toBe(201);
  const calc = (await created.json()).calculation as { id: string; version: number; number: string };
  const team = (await (await owner.request.get(`/api/w/${slug}/team?role=checker`)).json()).team as Array<{ userId: string; name: string }>;
  const checkerId = team.find((m) => m.name === "Chloe Checker")!.userId;
  const submit = await owner.request.post(`/api/w/${slug}/calculations/${calc.id}/transitions`, { data: { action: "submit", version: calc.version, checkerId } });
  expect(submit.status()).toBe(200);
  const approve = await checker.request.post(`/api/w/${slug}/calculations/${calc.id}/transitions`, { data: { action: "approve", version: calc.version + 1 } });
  expect(approve.status()).toBe(200);

  // The checker issues it from the sheet.
  await checker.goto(`${projectUrl}/calculations/${calc.id}`);
  await expect(checker.getByTestId("calc-status")).toHaveText("Approved");
  await checker.getByRole("button", { name: "Issue report" }).click();
  const dialog = checker.getByRole("dialog", { name: "Issue revision A" });
  await expect(dialog).toContainText("cannot change");
  await dialog.getByRole("button", { name: "Sign and issue" }).click();
  await expect(checker.getByTestId("calc-status")).toHaveText("Issued", { timeout: 30_000 });
  await checker.screenshot({ path: info.outputPath("sheet-issued.png"), fullPage: false });
  const downloadLink = checker.getByTestId("download-report");
  await expect(downloadLink).toHaveText("Download PDF (rev A)");
  const [download] = await Promise.all([checker.waitForEvent("download"), downloadLink.click()]);
  expect(download.suggestedFilename()).toBe(`${calc.number} rev A – Sensor front end.pdf`);
  const pdfPath = info.outputPath("issued.pdf");
  await download.saveAs(pdfPath);
  const pdf = fs.readFileSync(pdfPath);
  expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");

  const listed = (await (await checker.request.get(`/api/w/${slug}/reports?calculationId=${calc.id}`)).json()).reports as Array<{ code: string; sha256: string }>;
  expect(listed).toHaveLength(1);
  const code = listed[0].code;

  // Anyone can verify it, signed in or not: by code …
  const pubCtx = await browser.newContext();
  const pub = await pubCtx.newPage();
  await pub.goto("/verify");
  await expect(pub.getByRole("heading", { name: "Verify a calculation report" })).toBeVisible();
  await pub.getByLabel("Verification code").fill(code.toLowerCase());
  await pub.getByRole("button", { name: "Check code" }).click();
  const byCode = pub.getByTestId("verify-result").first();
  await expect(byCode).toContainText("Issued report found");
  await expect(byCode).toContainText("Brookfield Signal Works");
  await expect(byCode).toContainText(projectName);
  await expect(byCode).toContainText("Ines Owner"); // prepared
  await expect(byCode).toContainText("Chloe Checker"); // checked and approved
  await expect(byCode).toContainText("Current revision");

  // … and by uploading the file: the issued bytes match, a changed copy does not.
  await pub.getByLabel("Report PDF").setInputFiles(pdfPath);
  await pub.getByRole("button", { name: "Check file" }).click();
  const byFile = pub.getByTestId("verify-result").nth(1);
  await expect(byFile).toContainText("Matches an issued report");
  await expect(byFile).toContainText(listed[0].sha256);
  const changed = Buffer.from(pdf);
  const at = changed.indexOf("stream\n") + 40;
  changed[at] ^= 0x01;
  await pub.getByLabel("Report PDF").setInputFiles({ name: "issued.pdf", mimeType: "application/pdf", buffer: changed });
  await pub.getByRole("button", { name: "Check file" }).click();
  await expect(byFile).toContainText("Does not match any issued report");
  await expect(byFile).toContainText("changed since");
  await pub.screenshot({ path: info.outputPath("verify.png"), fullPage: true });

  // The client is told by e-mail, sees the issued report (and no calculations) and downloads it.
  const mail = await waitForMail(clientEmail, /Report issued/);
  expect(mail.subject).toBe(`Report issued: ${calc.number} rev A – Sensor front end`);
  await client.goto(firstLink(mail));
  await expect(client.getByRole("heading", { name: projectName })).toBeVisible();
  const row = client.getByTestId("report-row");
  await expect(row).toHaveCount(1);
  await expect(row).toContainText(code);
  await expect(row).toContainText("current");
  await expect(client.getByRole("heading", { name: "Calculation register" })).toHaveCount(0);
  await client.screenshot({ path: info.outputPath("client-project.png"), fullPage: true });
  const [clientDownload] = await Promise.all([client.waitForEvent("download"), row.getByRole("link", { name: /Download/ }).click()]);
  const clientPath = info.outputPath("client.pdf");
  await clientDownload.saveAs(clientPath);
  expect(fs.readFileSync(clientPath).equals(pdf)).toBe(true);
  // The calculation itself stays out of reach.
  expect((await client.request.get(`/api/w/${slug}/calculations/${calc.id}`)).status()).toBe(403);

  await Promise.all([ownerCtx.close(), pubCtx.close(), checker.context().close(), client.context().close()]);
});
