import { expect, type Page, test } from "@playwright/test";
import { SIGN_IN_FAILED } from "@/lib/auth/messages";
import {
  DEMO_EMAIL,
  navLabels,
  signIn,
  signInAs,
  signInMessage,
  signOut,
  submitSignIn,
  uniqueEmail,
} from "./helpers";

const FIRST_PASSWORD = "scale-and-bench-42";

/** The owner adds a person through the Staff & access page and sees the confirmation. */
async function addPerson(page: Page, name: string, email: string, role: string) {
  await page.goto("/users");
  const form = page.locator("form", { has: page.getByRole("heading", { name: "Add a person" }) });
  await form.getByLabel("Name", { exact: true }).fill(name);
  await form.getByLabel("E-mail", { exact: true }).fill(email);
  await form.getByLabel("First password (10 characters or more)").fill(FIRST_PASSWORD);
  await form.getByLabel("Role", { exact: true }).selectOption(role);
  await form.getByRole("button", { name: "Add" }).click();
  await expect(form.getByTestId("action-message")).toHaveText(
    `${name} can now sign in as ${role}.`,
  );
  await expect(page.getByTestId(`user-${email}`)).toBeVisible();
}

test.describe("staff and access", () => {
  test("the owner adds a machinist who can then sign in, and disabling them shuts them out", async ({
    page,
    browser,
  }) => {
    const email = uniqueEmail("new-machinist");
    await signInAs(page, "owner");
    await addPerson(page, "Corin Vale", email, "machinist");

    // The new machinist, in a browser of their own.
    const theirs = await browser.newContext();
    const machinist = await theirs.newPage();
    await signIn(machinist, email, FIRST_PASSWORD);
    const labels = await navLabels(machinist);
    expect(labels).toEqual(expect.arrayContaining(["Jobs", "Customers"]));
    expect(labels).not.toContain("Staff & access");
    await expect(machinist.getByText("Corin Vale")).toBeVisible();

    const row = page.getByTestId(`user-${email}`);
    await row.getByRole("button", { name: "Disable" }).click();
    await expect(row.getByText("Disabled", { exact: true })).toBeVisible();

    // Already signed in: the next page they open sends them to sign-in.
    await machinist.goto("/customers");
    await expect(machinist).toHaveURL(/\/sign-in/);
    // And signing in again is refused, in the same words as any failed sign-in.
    await submitSignIn(machinist, email, FIRST_PASSWORD);
    await expect(signInMessage(machinist)).toHaveText(SIGN_IN_FAILED);
    await expect(machinist).toHaveURL(/\/sign-in/);
    await theirs.close();
  });

  test("after five wrong passwords the next try waits, even with the right password", async ({
    page,
  }) => {
    const email = uniqueEmail("locked-counter");
    await signInAs(page, "owner");
    await addPerson(page, "Tamsin Orr", email, "counter");
    await signOut(page);

    for (let attempt = 1; attempt <= 5; attempt++) {
      await submitSignIn(page, email, `wrong-guess-${attempt}`);
      await expect(signInMessage(page)).toHaveText(SIGN_IN_FAILED);
    }

    // Slowed (30 s at first): the right password is not even checked yet, and the answer is
    // the same one, so it does not tell a guesser that the guess was right.
    await submitSignIn(page, email, FIRST_PASSWORD);
    await expect(signInMessage(page)).toHaveText(SIGN_IN_FAILED);
    await expect(page).toHaveURL(/\/sign-in/);

    // Another e-mail is not affected.
    await signIn(page, DEMO_EMAIL.counter);
  });
});
