"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { type Resolver, useForm } from "react-hook-form";
import type { z } from "zod";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import type { CounterSettings } from "@/db/counter-settings";
import { ApiError, apiFetch } from "@/lib/api-client";
import { CUSTOMER_MAIL_KINDS, CUSTOMER_MAIL_LABEL } from "@/lib/mail/templates";
import { counterSettingsSchema } from "@/lib/validation/counter-settings";

type Values = z.input<typeof counterSettingsSchema>;
type Parsed = z.output<typeof counterSettingsSchema>;

/** Every zone the browser knows, the shop's own first if it is not among them. */
function zones(current: string): string[] {
  const known =
    typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : [];
  return [...new Set([current, "UTC", ...known])];
}

/** The form's boxes as the stored settings fill them. */
function valuesOf(settings: CounterSettings): Values {
  return {
    version: settings.version,
    senderName: settings.senderName ?? "",
    replyTo: settings.replyTo ?? "",
    signature: settings.signature ?? "",
    mailOff: settings.mailOff as Values["mailOff"],
    timeZone: settings.timeZone,
  };
}

/**
 * The owner's settings for the shop's e-mails to customers (who they come from, where replies
 * go, the signature, which messages go out) and the shop's time zone.
 */
export function CounterSettingsForm({
  initial,
  shopName,
  shopEmail,
}: {
  initial: CounterSettings;
  shopName: string;
  shopEmail: string | null;
}) {
  const [version, setVersion] = useState(initial.version);
  const [message, setMessage] = useState<string | null>(null);
  const [serverFields, setServerFields] = useState<Record<string, string>>({});
  const [stale, setStale] = useState<unknown>(null);
  const [loading, setLoading] = useState(false);
  const [zoneList, setZoneList] = useState(() => zones(initial.timeZone));
  const form = useForm<Values, unknown, Parsed>({
    resolver: zodResolver(counterSettingsSchema) as unknown as Resolver<Values, unknown, Parsed>,
    defaultValues: valuesOf(initial),
  });
  const errors = form.formState.errors;
  const off = form.watch("mailOff");

  const save = form.handleSubmit(
    async (v) => {
      setServerFields({});
      try {
        const { settings } = await apiFetch<{ settings: CounterSettings }>(
          "/api/settings/counter",
          { method: "PUT", body: { ...v, version } },
        );
        setVersion(settings.version);
        form.setValue("version", settings.version);
        setMessage("Saved.");
      } catch (e) {
        if (isStaleWrite(e)) {
          setStale(e);
          setMessage(null);
        } else if (e instanceof ApiError) {
          setServerFields(e.fields);
          setMessage(`Not saved: ${e.message}`);
        } else setMessage("Not saved: the server could not be reached.");
      }
    },
    () => setMessage("Not saved: a box needs attention (marked below)."),
  );

  /** After a stale save: the settings as saved now replace what was typed. */
  async function loadLatest() {
    setLoading(true);
    try {
      const { settings } = await apiFetch<{ settings: CounterSettings }>("/api/settings/counter");
      setVersion(settings.version);
      setZoneList(zones(settings.timeZone));
      form.reset(valuesOf(settings));
      setStale(null);
      setServerFields({});
      setMessage("The latest settings are loaded: change them again if needed and save.");
    } catch {
      setMessage("The server could not be reached; try again.");
    } finally {
      setLoading(false);
    }
  }

  const problem = (key: "senderName" | "replyTo" | "signature" | "timeZone") => {
    const text = errors[key]?.message ?? serverFields[key];
    return text ? (
      <span className="mt-1 block text-xs text-replace" role="alert">
        {text}
      </span>
    ) : null;
  };

  return (
    <form onSubmit={save} className="space-y-6" noValidate>
      <section className="panel grid gap-3 p-4 sm:grid-cols-2" aria-labelledby="mail-from">
        <h2 id="mail-from" className="font-semibold sm:col-span-2">
          E-mails to customers
        </h2>
        <div className="text-sm">
          <label className="block">
            <span className="mb-1 block font-semibold">Sender name</span>
            <input
              className="field-input"
              placeholder={shopName}
              {...form.register("senderName")}
            />
          </label>
          {problem("senderName")}
        </div>
        <div className="text-sm">
          <label className="block">
            <span className="mb-1 block font-semibold">Replies go to</span>
            <input
              className="field-input"
              type="email"
              placeholder={shopEmail ?? "desk@your-shop.example"}
              {...form.register("replyTo")}
            />
          </label>
          {problem("replyTo")}
        </div>
        <div className="text-sm sm:col-span-2">
          <label className="block">
            <span className="mb-1 block font-semibold">Signature</span>
            <textarea
              className="field-input"
              rows={3}
              placeholder={`${shopName}\nphone, address…`}
              {...form.register("signature")}
            />
          </label>
          {problem("signature")}
          <p className="mt-1 text-xs text-graphite-600">
            Blank boxes use the shop&apos;s name and e-mail from the shop settings.
          </p>
        </div>
        <fieldset className="text-sm sm:col-span-2">
          <legend className="mb-1 font-semibold">Send these messages</legend>
          <div className="grid gap-1 sm:grid-cols-3">
            {CUSTOMER_MAIL_KINDS.map((kind) => (
              <label key={kind} className="flex items-center gap-2">
                <input
                  type="checkbox"
                  checked={!off.includes(kind)}
                  onChange={(e) =>
                    form.setValue(
                      "mailOff",
                      e.target.checked ? off.filter((k) => k !== kind) : [...off, kind],
                      { shouldDirty: true },
                    )
                  }
                />
                {CUSTOMER_MAIL_LABEL[kind]}
              </label>
            ))}
          </div>
        </fieldset>
      </section>

      <section className="panel p-4 text-sm" aria-labelledby="shop-time">
        <h2 id="shop-time" className="mb-2 font-semibold">
          Shop time zone
        </h2>
        <label className="block max-w-sm">
          <span className="mb-1 block font-semibold">Time zone</span>
          <select className="field-input" {...form.register("timeZone")}>
            {zoneList.map((z) => (
              <option key={z} value={z}>
                {z}
              </option>
            ))}
          </select>
        </label>
        {problem("timeZone")}
        <p className="mt-1 text-xs text-graphite-600">
          Dates shown, &quot;due today&quot; and &quot;overdue&quot; on the board follow the
          shop&apos;s calendar in this zone.
        </p>
      </section>

      <div className="flex items-center gap-4">
        <button type="submit" className="btn-primary" disabled={form.formState.isSubmitting}>
          Save
        </button>
        <p aria-live="polite" className="text-sm" data-testid="counter-settings-message">
          {message}
        </p>
      </div>
      {stale ? (
        <ChangedElsewhere
          what="the e-mail and time zone settings"
          error={stale}
          loading={loading}
          onReload={() => void loadLatest()}
        />
      ) : null}
    </form>
  );
}
