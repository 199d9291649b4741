import { beforeEach, describe, expect, it } from "vitest";
import { createPriceAction, updatePriceAction } from "@/app/(shop)/prices/actions";
import { saveSettingsAction } from "@/app/(shop)/settings/actions";
import { PATCH as patchPrice } from "@/app/api/prices/[id]/route";
import { GET as getPrices, POST as postPrice } from "@/app/api/prices/route";
import { GET as getSettings, PUT as putSettings } from "@/app/api/settings/route";
import type { DB } from "@/db/client";
import { findShopSettings } from "@/db/settings";
import { freshDb } from "../../helpers/db";
import { jsonRequest, noParams, params } from "../../helpers/http";
import { signInAs } from "../../helpers/session";
import { type BillingWorld, setUpBilling } from "./fixtures";

let db: DB;
let w: BillingWorld;

beforeEach(async () => {
  db = await freshDb();
  w = await setUpBilling(db);
});

const settingsBody = (version: number, changes: Record<string, unknown> = {}) => ({
  version,
  shopName: "Test Balancing",
  address: "1 Test Lane",
  phone: "555-0100",
  email: "shop@shop.test",
  taxRate: "8.875",
  currency: "usd",
  invoiceFooter: "Due in 14 days.",
  maxUploadMb: "25",
  ...changes,
});

describe("shop settings", () => {
  it("are readable by every shop role and not by customers", async () => {
    for (const role of ["owner", "machinist", "counter"] as const) {
      signInAs(w.users[role]);
      const res = await getSettings(jsonRequest("GET", "/api/settings"), noParams);
      expect(res.status).toBe(200);
      expect((await res.json()).settings).toMatchObject({
        shopName: "Test Balancing",
        taxRate: "20",
      });
    }
    signInAs(w.users.customer);
    expect((await getSettings(jsonRequest("GET", "/api/settings"), noParams)).status).toBe(403);
    signInAs(null);
    expect((await getSettings(jsonRequest("GET", "/api/settings"), noParams)).status).toBe(401);
  });

  it("are changed by the owner only, with the version read, keeping rates as decimal strings", async () => {
    signInAs(w.users.counter);
    expect(
      (await putSettings(jsonRequest("PUT", "/api/settings", settingsBody(1)), noParams)).status,
    ).toBe(403);
    signInAs(w.users.owner);
    const res = await putSettings(jsonRequest("PUT", "/api/settings", settingsBody(1)), noParams);
    expect(res.status).toBe(200);
    expect((await res.json()).settings).toMatchObject({
      taxRate: "8.875",
      currency: "USD",
      maxUploadMb: "25",
      version: 2,
    });
    const stale = await putSettings(jsonRequest("PUT", "/api/settings", settingsBody(1)), noParams);
    expect(stale.status).toBe(409);
  });

  it("refuse a tax rate over 100 %, a float-looking rate, and a currency without cents", async () => {
    signInAs(w.users.owner);
    const res = await putSettings(
      jsonRequest(
        "PUT",
        "/api/settings",
        settingsBody(1, { taxRate: "120", currency: "JPY", maxUploadMb: "0" }),
      ),
      noParams,
    );
    expect(res.status).toBe(422);
    expect(Object.keys((await res.json()).error.fields).sort()).toEqual([
      "currency",
      "maxUploadMb",
      "taxRate",
    ]);
    const numeric = await putSettings(
      jsonRequest("PUT", "/api/settings", settingsBody(1, { taxRate: 20 })),
      noParams,
    );
    expect(numeric.status).toBe(422);
  });

  it("are saved through the page's server action too", async () => {
    signInAs(w.users.owner);
    const form = new FormData();
    for (const [k, v] of Object.entries(settingsBody(1, { taxRate: "7.5" })))
      form.set(k, String(v));
    expect(await saveSettingsAction(null, form)).toMatchObject({
      ok: true,
      data: { taxRate: "7.5" },
    });
    expect((await findShopSettings(db)).taxRate).toBe("7.5");
    signInAs(w.users.counter);
    expect(await saveSettingsAction(null, form)).toMatchObject({ ok: false, status: 403 });
  });
});

describe("the price list", () => {
  it("is kept by the owner: the counter may read it but not add or change prices", async () => {
    signInAs(w.users.counter);
    const list = await getPrices(jsonRequest("GET", "/api/prices?active=1"), noParams);
    expect((await list.json()).prices.map((p: { code: string }) => p.code)).toEqual([
      "BAL-I4",
      "MCH-PIS",
      "MCH-ROD",
      "RUSH",
    ]);
    const add = await postPrice(
      jsonRequest("POST", "/api/prices", {
        code: "X",
        description: "Cheap",
        kind: "other",
        unitPrice: "0.01",
      }),
      noParams,
    );
    expect(add.status).toBe(403);
    const change = await patchPrice(
      jsonRequest("PATCH", "/x", { version: 1, unitPrice: "1.00" }),
      params({ id: String(w.prices.balance.id) }),
    );
    expect(change.status).toBe(403);
    const form = new FormData();
    form.set("id", String(w.prices.balance.id));
    form.set("version", "1");
    form.set("code", "BAL-I4");
    form.set("description", "Balance");
    form.set("kind", "balancing-by-layout");
    form.set("unitPrice", "1.00");
    expect(await updatePriceAction(null, form)).toMatchObject({ ok: false, status: 403 });
  });

  it("takes new prices from the owner, with codes unique and prices as decimal strings", async () => {
    signInAs(w.users.owner);
    const res = await postPrice(
      jsonRequest("POST", "/api/prices", {
        code: "add-fly",
        description: "Flywheel with the assembly",
        kind: "extra-rotating-part",
        unitPrice: "55",
      }),
      noParams,
    );
    expect(res.status).toBe(201);
    expect((await res.json()).price).toMatchObject({
      code: "ADD-FLY",
      unitPrice: "55",
      active: true,
    });
    const twin = await postPrice(
      jsonRequest("POST", "/api/prices", {
        code: "ADD-FLY",
        description: "Again",
        kind: "other",
        unitPrice: "1",
      }),
      noParams,
    );
    expect(twin.status).toBe(409);
    const bad = await postPrice(
      jsonRequest("POST", "/api/prices", {
        code: "Z",
        description: "Z",
        kind: "magic",
        unitPrice: "1.23456",
      }),
      noParams,
    );
    expect(bad.status).toBe(422);
    expect(Object.keys((await bad.json()).error.fields).sort()).toEqual(["kind", "unitPrice"]);
  });

  it("changes a price with the version read and turns an entry off", async () => {
    signInAs(w.users.owner);
    const res = await patchPrice(
      jsonRequest("PATCH", "/x", { version: 1, unitPrice: "299.50", active: false }),
      params({ id: String(w.prices.balance.id) }),
    );
    expect((await res.json()).price).toMatchObject({
      unitPrice: "299.50",
      active: false,
      version: 2,
    });
    const stale = await patchPrice(
      jsonRequest("PATCH", "/x", { version: 1, unitPrice: "1.00" }),
      params({ id: String(w.prices.balance.id) }),
    );
    expect(stale.status).toBe(409);
  });

  it("is added to through the page's server action", async () => {
    signInAs(w.users.owner);
    const form = new FormData();
    form.set("code", "OTH-HOUR");
    form.set("description", "Bench time");
    form.set("kind", "other");
    form.set("unitPrice", "85.00");
    expect(await createPriceAction(null, form)).toMatchObject({
      ok: true,
      data: { code: "OTH-HOUR" },
    });
  });
});
