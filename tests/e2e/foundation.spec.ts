/**
 * As a new firm would: sign up, create projects, invite an engineer and a client by e-mail (read
 * from the mail sink), accept in other browser contexts, and see what each role allows.
 */
import { expect, test } from "@playwright/test";
import { firstLink, signIn, signUp, uniqueEmail, waitForMail } from "./support";

test("sign up, invite an engineer and a client, and each sees only what the role allows", async ({ browser }) => {
  const ownerCtx = await browser.newContext();
  const owner = await ownerCtx.newPage();
  const ownerEmail = uniqueEmail("owner");
  const slug = await signUp(owner, { name: "Olive Owner", email: ownerEmail, password: "owner password 1", firm: "Quarry Hill Circuits" });
  await expect(owner.getByRole("combobox", { name: "Workspace" })).toHaveValue(slug);
  await expect(owner.locator("select[aria-label=Workspace] option:checked")).toHaveText("Quarry Hill Circuits (owner)");
  await expect(owner.getByTestId("current-role")).toHaveText("Owner");

  // Two projects: P will be shared with the client, Q will not.
  for (const name of ["Project P — preamp", "Project Q — line driver"]) {
    await owner.getByLabel("Project name").fill(name);
    await owner.getByRole("button", { name: "Create project" }).click();
    await expect(owner.getByRole("link", { name })).toBeVisible();
  }
  const projectQUrl = await owner.getByRole("link", { name: "Project Q — line driver" }).getAttribute("href");

  // Invite an engineer.
  await owner.getByRole("link", { name: "Members" }).click();
  const engineerEmail = uniqueEmail("engineer");
  await owner.getByLabel("E-mail", { exact: true }).fill(engineerEmail);
  await owner.getByLabel("Role", { exact: true }).selectOption("engineer");
  await owner.getByRole("button", { name: "Send invitation" }).click();
  await expect(owner.getByText(`Invitation e-mailed to ${engineerEmail}.`)).toBeVisible();
  await expect(owner.getByRole("table", { name: "Pending invitations" })).toContainText(engineerEmail);

  // The engineer reads the mail and accepts in a second browser context.
  const inviteMail = await waitForMail(engineerEmail, /invited you to Quarry Hill Circuits/);
  const engCtx = await browser.newContext();
  const eng = await engCtx.newPage();
  await eng.goto(firstLink(inviteMail));
  await expect(eng.getByRole("heading", { name: "Join Quarry Hill Circuits" })).toBeVisible();
  await eng.getByLabel("Your name").fill("Evan Engineer");
  await eng.getByLabel("Choose a password").fill("engineer password 1");
  await eng.getByRole("button", { name: "Create account and join" }).click();
  await eng.waitForURL(new RegExp(`/w/${slug}/projects$`));
  await expect(eng.getByTestId("current-role")).toHaveText("Engineer");
  await expect(eng.getByRole("link", { name: "Project Q — line driver" })).toBeVisible();
  // Engineers create projects but do not administer members or billing.
  await expect(eng.getByRole("button", { name: "Create project" })).toBeVisible();
  const nav = eng.getByRole("navigation", { name: "Workspace sections" });
  await expect(nav.getByRole("link", { name: "Projects" })).toBeVisible();
  await expect(nav.getByRole("link", { name: "Members" })).toHaveCount(0);
  await expect(nav.getByRole("link", { name: "Billing" })).toHaveCount(0);
  await eng.goto(`/w/${slug}/members`);
  await expect(eng.getByRole("heading", { name: "Not allowed for your role" })).toBeVisible();
  const api = await eng.request.get(`/api/w/${slug}/members`);
  expect(api.status()).toBe(403);

  // The used invitation link does not work twice.
  await eng.goto(firstLink(inviteMail));
  await expect(eng.getByText("This invitation has already been used.")).toBeVisible();

  // Invite a client to project P only.
  await owner.reload();
  await owner.getByLabel("Role", { exact: true }).selectOption("client");
  await owner.getByLabel("Project P — preamp").check();
  const clientEmail = uniqueEmail("client");
  await owner.getByLabel("E-mail", { exact: true }).fill(clientEmail);
  await owner.getByRole("button", { name: "Send invitation" }).click();
  await expect(owner.getByText(`Invitation e-mailed to ${clientEmail}.`)).toBeVisible();
  const clientMail = await waitForMail(clientEmail, /invited you/);
  const clientCtx = await browser.newContext();
  const client = await clientCtx.newPage();
  await client.goto(firstLink(clientMail));
  await client.getByLabel("Your name").fill("Cara Client");
  await client.getByLabel("Choose a password").fill("client password 1");
  await client.getByRole("button", { name: "Create account and join" }).click();
  await client.waitForURL(new RegExp(`/w/${slug}/projects$`));
  await expect(client.getByTestId("current-role")).toHaveText("Client");
  await expect(client.getByRole("link", { name: "Project P — preamp" })).toBeVisible();
  await expect(client.getByRole("link", { name: "Project Q — line driver" })).toHaveCount(0);
  await expect(client.getByRole("button", { name: "Create project" })).toHaveCount(0);
  await client.goto(projectQUrl!);
  await expect(client.getByRole("heading", { name: "Not found" })).toBeVisible();

  // The owner sees all three members with their roles.
  await owner.reload();
  const members = owner.getByRole("table", { name: "Members" });
  await expect(members).toContainText("Evan Engineer");
  await expect(members).toContainText("Cara Client");
  await expect(owner.getByLabel("Role of Evan Engineer")).toHaveValue("engineer");

  await Promise.all([ownerCtx.close(), engCtx.close(), clientCtx.close()]);
});

test("a wrong password is refused with a clear message; a sign-in link works once", async ({ page, browser }) => {
  const email = uniqueEmail("linker");
  await signUp(page, { name: "Lin Link", email, password: "first password 1", firm: "Link Test Ltd" });
  await page.context().clearCookies();

  await page.goto("/signin");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill("not my password");
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await expect(page.getByText("No account matches that e-mail and password.")).toBeVisible();

  await page.getByRole("button", { name: "E-mail me a sign-in link" }).click();
  await expect(page.getByText(`If an account exists for ${email}`)).toBeVisible();
  const mail = await waitForMail(email, /sign-in link/);
  const ctx = await browser.newContext();
  const p2 = await ctx.newPage();
  await p2.goto(firstLink(mail));
  await p2.getByRole("button", { name: "Continue to Loopwright" }).click();
  await p2.waitForURL(/\/w\/[^/]+\/projects$/);
  await expect(p2.locator("select[aria-label=Workspace] option:checked")).toHaveText("Link Test Ltd (owner)");
  await p2.context().clearCookies();
  await p2.goto(firstLink(mail));
  await p2.getByRole("button", { name: "Continue to Loopwright" }).click();
  await expect(p2.getByText("This sign-in link is not valid any more")).toBeVisible();
  await ctx.close();

  await signIn(page, email, "first password 1");
});
