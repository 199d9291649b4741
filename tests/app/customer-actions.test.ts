import { beforeEach, describe, expect, it } from "vitest";
import { createCustomerAction } from "@/app/(shop)/customers/actions";
import type { DB } from "@/db/client";
import { addTestUser, countRows, freshDb } from "../helpers/db";
import { signInAs } from "../helpers/session";

let db: DB;
beforeEach(async () => {
  db = await freshDb();
  signInAs(await addTestUser(db, "counter"));
});

describe("adding a customer from the page", () => {
  it("ignores React's own action entries in the form data", async () => {
    const form = new FormData();
    form.set("$ACTION_REF_1", "");
    form.set("$ACTION_1:0", '{"id":"abc","bound":"$@1"}');
    form.set("name", "Halvard Penn");
    form.set("email", "halvard@example.test");
    form.set("company", "");
    expect(await createCustomerAction(null, form)).toMatchObject({
      ok: true,
      data: { name: "Halvard Penn", company: null },
    });
  });

  it("answers a missing name with a message on that field and writes nothing", async () => {
    const before = await countRows(db, "customers");
    const form = new FormData();
    form.set("email", "x@example.test");
    expect(await createCustomerAction(null, form)).toMatchObject({
      ok: false,
      status: 422,
      fields: { name: expect.any(String) },
    });
    expect(await countRows(db, "customers")).toBe(before);
  });
});
