"use client";

import { useState } from "react";
import { ChangedElsewhere, isStaleWrite } from "@/components/ui/changed-elsewhere";
import { ApiError, apiFetch } from "@/lib/api-client";
import { RING_POSITIONS, RING_USES } from "@/lib/build-record/schemas";
import type { BuildSettings, RingFactorRow } from "@/lib/build-record/settings-schema";

export const RING_WORDS = { top: "Top ring", second: "Second ring", oil: "Oil rails" } as const;
export const USE_WORDS = { street: "Street", boost: "Boost / nitrous", race: "Race" } as const;

type Row = {
  maker: string;
  position: RingFactorRow["position"];
  use: RingFactorRow["use"];
  factor: string;
};

/** The owner's build settings: the ring gap factor table and the shop's guides. */
export function BuildSettingsForm({
  initial,
  version: initialVersion,
}: {
  initial: BuildSettings;
  version: number;
}) {
  const [rows, setRows] = useState<Row[]>(initial.ringFactors);
  const [unit, setUnit] = useState(initial.lengthUnit);
  const [margin, setMargin] = useState(initial.minCoilBindMargin ?? "");
  const [perMin, setPerMin] = useState(initial.clearancePerInch.min ?? "");
  const [perMax, setPerMax] = useState(initial.clearancePerInch.max ?? "");
  const [lift, setLift] = useState(initial.camCheckLift ?? "");
  const [version, setVersion] = useState(initialVersion);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const [stale, setStale] = useState<unknown>(null);
  const [loading, setLoading] = useState(false);

  /** Every box as the stored settings fill them. */
  function fill(settings: BuildSettings, storedVersion: number) {
    setRows(settings.ringFactors);
    setUnit(settings.lengthUnit);
    setMargin(settings.minCoilBindMargin ?? "");
    setPerMin(settings.clearancePerInch.min ?? "");
    setPerMax(settings.clearancePerInch.max ?? "");
    setLift(settings.camCheckLift ?? "");
    setVersion(storedVersion);
  }

  /** After a stale save: the settings as saved now replace what was typed. */
  async function loadLatest() {
    setLoading(true);
    try {
      const latest = await apiFetch<{ settings: BuildSettings; version: number }>(
        "/api/settings/build",
      );
      fill(latest.settings, latest.version);
      setStale(null);
      setFields({});
      setMessage({
        ok: true,
        text: "The latest settings are loaded: change them again if needed and save.",
      });
    } catch {
      setMessage({ ok: false, text: "Could not reach the server; try again." });
    } finally {
      setLoading(false);
    }
  }

  const setRow = (i: number, change: Partial<Row>) =>
    setRows((all) => all.map((r, j) => (j === i ? { ...r, ...change } : r)));

  async function save() {
    setBusy(true);
    setFields({});
    setMessage(null);
    setStale(null);
    try {
      const saved = await apiFetch<{ settings: BuildSettings; version: number }>(
        "/api/settings/build",
        {
          method: "PUT",
          body: {
            version,
            settings: {
              ringFactors: rows,
              lengthUnit: unit,
              minCoilBindMargin: margin,
              clearancePerInch: { min: perMin, max: perMax },
              camCheckLift: lift,
            },
          },
        },
      );
      setVersion(saved.version);
      setRows(saved.settings.ringFactors);
      setMessage({ ok: true, text: "Saved." });
    } catch (e) {
      if (isStaleWrite(e)) setStale(e);
      else if (e instanceof ApiError) {
        setFields(e.fields);
        setMessage({ ok: false, text: e.message });
      } else setMessage({ ok: false, text: "Could not reach the server; nothing was saved." });
    } finally {
      setBusy(false);
    }
  }

  const err = (key: string) =>
    fields[`settings.${key}`] ? (
      <span className="block text-xs text-replace">{fields[`settings.${key}`]}</span>
    ) : null;

  return (
    <form
      className="space-y-6"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      <section className="panel overflow-x-auto p-4">
        <h2 className="mb-1 font-semibold">Ring gap factors</h2>
        <p className="mb-3 text-sm text-graphite-600">
          End gap = factor × finished bore (0.0045 means 0.0045 in per inch of bore, or mm per mm).
          One row per ring set, ring and use, from that ring maker&apos;s figures.
        </p>
        <table className="w-full min-w-[36rem] text-sm">
          <thead>
            <tr className="text-left text-graphite-500">
              <th className="py-1 font-semibold">Ring maker or set</th>
              <th className="py-1 font-semibold">Ring</th>
              <th className="py-1 font-semibold">Use</th>
              <th className="w-28 py-1 font-semibold">Factor</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {rows.map((r, i) => (
              <tr key={i}>
                <td className="py-1 pr-2">
                  <input
                    className="field-input"
                    aria-label={`Ring maker, row ${i + 1}`}
                    value={r.maker}
                    onChange={(e) => setRow(i, { maker: e.target.value })}
                  />
                  {err(`ringFactors.${i}.maker`)}
                </td>
                <td className="py-1 pr-2">
                  <select
                    className="field-input"
                    aria-label={`Ring, row ${i + 1}`}
                    value={r.position}
                    onChange={(e) => setRow(i, { position: e.target.value as Row["position"] })}
                  >
                    {RING_POSITIONS.map((p) => (
                      <option key={p} value={p}>
                        {RING_WORDS[p]}
                      </option>
                    ))}
                  </select>
                </td>
                <td className="py-1 pr-2">
                  <select
                    className="field-input"
                    aria-label={`Use, row ${i + 1}`}
                    value={r.use}
                    onChange={(e) => setRow(i, { use: e.target.value as Row["use"] })}
                  >
                    {RING_USES.map((u) => (
                      <option key={u} value={u}>
                        {USE_WORDS[u]}
                      </option>
                    ))}
                  </select>
                </td>
                <td className="py-1 pr-2">
                  <input
                    className="field-input font-mono"
                    inputMode="decimal"
                    aria-label={`Factor, row ${i + 1}`}
                    value={r.factor}
                    onChange={(e) => setRow(i, { factor: e.target.value })}
                  />
                  {err(`ringFactors.${i}.factor`)}
                </td>
                <td className="py-1">
                  <button
                    type="button"
                    className="btn-secondary py-1"
                    onClick={() => setRows((all) => all.filter((_, j) => j !== i))}
                  >
                    Remove
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <button
          type="button"
          className="btn-secondary mt-2 py-1"
          onClick={() =>
            setRows((all) => [
              ...all,
              { maker: all.at(-1)?.maker ?? "", position: "top", use: "street", factor: "" },
            ])
          }
        >
          Add a row
        </button>
      </section>

      <section className="panel grid gap-4 p-4 sm:grid-cols-2">
        <label className="text-sm">
          <span className="mb-1 block font-semibold">These lengths in</span>
          <select
            className="field-input"
            value={unit}
            onChange={(e) => setUnit(e.target.value as "in" | "mm")}
          >
            <option value="in">inches</option>
            <option value="mm">millimetres</option>
          </select>
        </label>
        <label className="text-sm">
          <span className="mb-1 block font-semibold">Smallest coil-bind margin ({unit})</span>
          <input
            className="field-input font-mono"
            inputMode="decimal"
            value={margin}
            onChange={(e) => setMargin(e.target.value)}
          />
          {err("minCoilBindMargin")}
        </label>
        <label className="text-sm">
          <span className="mb-1 block font-semibold">Lift for cam checks ({unit})</span>
          <input
            className="field-input font-mono"
            inputMode="decimal"
            value={lift}
            onChange={(e) => setLift(e.target.value)}
          />
          {err("camCheckLift")}
        </label>
        <fieldset className="text-sm">
          <legend className="mb-1 font-semibold">Clearance per inch of journal (guide)</legend>
          <div className="flex items-center gap-2">
            <input
              className="field-input font-mono"
              inputMode="decimal"
              aria-label="Clearance per inch of journal, smallest"
              value={perMin}
              onChange={(e) => setPerMin(e.target.value)}
            />
            <span>to</span>
            <input
              className="field-input font-mono"
              inputMode="decimal"
              aria-label="Clearance per inch of journal, largest"
              value={perMax}
              onChange={(e) => setPerMax(e.target.value)}
            />
          </div>
          {err("clearancePerInch.min")}
          {err("clearancePerInch.max")}
        </fieldset>
      </section>

      <div className="flex items-center gap-3">
        <button type="submit" className="btn-primary" disabled={busy}>
          Save build settings
        </button>
        <p
          aria-live="polite"
          data-testid="build-settings-message"
          className={`text-sm ${message?.ok ? "text-within" : "text-replace"}`}
        >
          {message?.text}
        </p>
      </div>
      {stale ? (
        <ChangedElsewhere
          what="the build settings"
          error={stale}
          loading={loading}
          onReload={() => void loadLatest()}
        />
      ) : null}
    </form>
  );
}
