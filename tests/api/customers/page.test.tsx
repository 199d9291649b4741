import { renderToStaticMarkup } from "react-dom/server";
import { beforeEach, describe, expect, it } from "vitest";
import CustomerPage from "@/app/(shop)/customers/[id]/page";
import { mergeCustomerAction, updateCustomerAction } from "@/app/(shop)/customers/actions";
import CustomersPage from "@/app/(shop)/customers/page";
import { Providers } from "@/components/providers";
import type { DB } from "@/db/client";
import { updateCounterSettings } from "@/lib/settings/counter-settings";
import { type Customer, findCustomerById } from "@/db/customers";
import type { Role } from "@/db/schema";
import type { User } from "@/db/users";
import { mergeCustomers } from "@/lib/customers/merge";
import { addOneOfEachRole, addTestCustomer, freshDb } from "../../helpers/db";
import { signInAs } from "../../helpers/session";

let db: DB;
let users: Record<Role, User>;
let kept: Customer;
let dup: Customer;

beforeEach(async () => {
  db = await freshDb();
  users = await addOneOfEachRole(db);
  kept = await addTestCustomer(db, "Ansel Dorrance");
  dup = await addTestCustomer(db, "Ansel Dorance");
  signInAs(users.counter);
});

async function render(id: number, search: Record<string, string> = {}) {
  const element = await CustomerPage({
    params: Promise.resolve({ id: String(id) }),
    searchParams: Promise.resolve(search),
  });
  return renderToStaticMarkup(<Providers>{element}</Providers>);
}

describe("the customer page", () => {
  it("offers the counter the details to edit and a search for the duplicate to merge in", async () => {
    const html = await render(kept.id);
    expect(html).toContain('value="Ansel Dorrance"');
    expect(html).toContain("Save details");
    expect(html).toContain("Merge customers");
    // The duplicate is found by typing (any customer of the shop), not chosen from a list the
    // page carries: no other customer is written into the page.
    expect(html).toContain('role="combobox"');
    expect(html).not.toContain("Ansel Dorance");
  });

  it("shows a machinist the details without the forms", async () => {
    signInAs(users.machinist);
    const html = await render(kept.id);
    expect(html).toContain("Ansel Dorrance");
    expect(html).not.toContain("Save details");
    expect(html).not.toContain("Merge customers");
  });

  it("shows the merge in the history, timed on the shop's clock west of Greenwich", async () => {
    await updateCounterSettings(
      db,
      0,
      { senderName: null, replyTo: null, signature: null, mailOff: [], timeZone: "America/Denver" },
      null,
    );
    await mergeCustomers(db, kept.id, dup.id, users.counter.id);
    // A UTC evening: 01:30 UTC on the 3rd is 18:30 on the 2nd in Denver (MST, UTC−7, by hand).
    await db
      .updateTable("audit_log")
      .set({ at: "2026-12-03T01:30:00.000Z" } as never)
      .where("action", "=", "merge")
      .execute();
    const html = await render(kept.id, { merged: "1" });
    expect(html).toContain("Customers merged");
    expect(html).toContain(`Merged in Ansel Dorance (no. ${dup.id})`);
    expect(html).toContain("0 jobs");
    expect(html).toContain("2026-12-02 18:30 MST");
    expect(html).not.toContain("2026-12-03");
  });
});

describe("the customers list", () => {
  it("links each customer to their page, both as table rows and as phone-width cards", async () => {
    const element = await CustomersPage({ searchParams: Promise.resolve({}) });
    // Inside the app's providers, as the shop layout renders it (the invite button is a mutation).
    const html = renderToStaticMarkup(<Providers>{element}</Providers>);
    expect(html).toContain('data-testid="customer-cards"');
    expect(html.split(`href="/customers/${kept.id}"`).length - 1).toBe(2);
  });
});

function form(values: Record<string, string>) {
  const f = new FormData();
  for (const [k, v] of Object.entries(values)) f.set(k, v);
  return f;
}

describe("the customer page's actions", () => {
  it("saves details and names the field refused", async () => {
    const saved = await updateCustomerAction(
      null,
      form({ customerId: String(kept.id), name: "Ansel Dorrance", phone: "555 0199" }),
    );
    expect(saved).toMatchObject({ ok: true, message: "Details saved." });
    expect((await findCustomerById(db, kept.id))?.phone).toBe("555 0199");
    const refused = await updateCustomerAction(
      null,
      form({ customerId: String(kept.id), name: "" }),
    );
    expect(refused).toMatchObject({
      ok: false,
      status: 422,
      fields: { name: "Enter the customer's name." },
    });
  });

  it("asks for the tick and a customer before merging, and refuses a machinist", async () => {
    const unticked = await mergeCustomerAction(
      null,
      form({ customerId: String(kept.id), removeId: String(dup.id) }),
    );
    expect(unticked).toMatchObject({
      ok: false,
      fields: { confirm: "Tick the box to confirm the merge." },
    });
    const none = await mergeCustomerAction(
      null,
      form({ customerId: String(kept.id), confirm: "yes" }),
    );
    expect(none).toMatchObject({ ok: false, status: 422 });
    expect(none.ok ? undefined : none.fields?.removeId).toMatch(/customer to merge/);
    signInAs(users.machinist);
    const denied = await mergeCustomerAction(
      null,
      form({ customerId: String(kept.id), confirm: "yes", removeId: String(dup.id) }),
    );
    expect(denied).toMatchObject({ ok: false, status: 403 });
    expect(await findCustomerById(db, dup.id)).toBeDefined();
  });
});
