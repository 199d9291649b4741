"use client";

import { useEffect, useMemo, useRef, useState } from "react";
import { formatMass } from "@/lib/balance";
import {
  createReadingGate,
  type JobMassUnit,
  readingAtJobResolution,
  readingInJobUnit,
  type ScaleReading,
} from "@/lib/scale";
import { isWeighCell, typeIntoCell } from "./hand-to-cell";
import {
  BAUD_RATES,
  DEFAULT_SCALE_SETTINGS,
  describePortSettings,
  loadScaleSettings,
  rememberedPort,
  saveScaleSettings,
  type ScaleSettings,
} from "./scale-settings";
import { useScalePort } from "./use-scale-port";

type Live =
  | { kind: "waiting" }
  | { kind: "settling"; figure: string }
  | { kind: "empty"; figure: string }
  | { kind: "entered"; figure: string; into: string; accepted: boolean }
  | { kind: "held"; figure: string }
  | { kind: "no-box"; figure: string }
  | { kind: "below-zero"; figure: string }
  | { kind: "overload" }
  | { kind: "underload" }
  | { kind: "error"; text: string }
  | { kind: "refused"; message: string };

/** A figure as the scale gave it, through the display rule at the scale's own step. */
function scaleFigure(value: string, unit: string): string {
  const decimals = value.split(".")[1]?.length ?? 0;
  const step = decimals === 0 ? "1" : `0.${"0".repeat(decimals - 1)}1`;
  return `${formatMass(value, step)} ${unit}`;
}

/** "Cylinder 2 Piston, g" → "cylinder 2 piston". */
function boxName(input: HTMLInputElement): string {
  const label = input.getAttribute("aria-label") ?? "the weigh box";
  return label.replace(/,\s*\S+$/, "").toLowerCase();
}

type PortKey = "baudRate" | "dataBits" | "parity" | "stopBits" | "flowControl";

/** The port settings a scale's menu offers, each a choice of values: one select each. */
const PORT_CHOICES: {
  key: PortKey;
  label: string;
  options: { value: ScaleSettings[PortKey]; text: string }[];
}[] = [
  {
    key: "baudRate",
    label: "Baud rate",
    options: BAUD_RATES.map((b) => ({ value: b, text: `${b}` })),
  },
  { key: "dataBits", label: "Data bits", options: [8, 7].map((b) => ({ value: b, text: `${b}` })) },
  {
    key: "parity",
    label: "Parity",
    options: (["none", "even", "odd"] as const).map((p) => ({ value: p, text: p })),
  },
  { key: "stopBits", label: "Stop bits", options: [1, 2].map((b) => ({ value: b, text: `${b}` })) },
  {
    key: "flowControl",
    label: "Handshake",
    options: [
      { value: "none", text: "none" },
      { value: "hardware", text: "hardware (RTS/CTS)" },
    ],
  },
];

function PortSelect({
  choice,
  settings,
  disabled,
  onChange,
}: {
  choice: (typeof PORT_CHOICES)[number];
  settings: ScaleSettings;
  disabled: boolean;
  onChange: (patch: Partial<ScaleSettings>) => void;
}) {
  return (
    <label>
      <span className="mb-1 block">{choice.label}</span>
      <select
        className="rounded border border-graphite-300 px-2 py-1.5"
        value={String(settings[choice.key])}
        disabled={disabled}
        onChange={(e) => {
          const picked = choice.options.find((o) => String(o.value) === e.target.value);
          if (picked) onChange({ [choice.key]: picked.value });
        }}
      >
        {choice.options.map((o) => (
          <option key={String(o.value)} value={String(o.value)}>
            {o.text}
          </option>
        ))}
      </select>
    </label>
  );
}

/**
 * Reads the shop scale over a serial or USB-serial port (Web Serial) on the weigh-in page.
 * Settling readings, overloads and error lines are shown and never saved; a stable reading is
 * typed into the weigh box that has the cursor, as the machinist would type it, and Enter is
 * pressed too when the machinist asks for it. Where the browser cannot open a port it says why
 * and typing goes on as before.
 */
export function ConnectScale({ unit, resolution }: { unit: JobMassUnit; resolution: string }) {
  const [settings, setSettings] = useState<ScaleSettings>(DEFAULT_SCALE_SETTINGS);
  const [live, setLive] = useState<Live>({ kind: "waiting" });
  const [commandMessage, setCommandMessage] = useState<string | null>(null);
  // Said once: the scale reads finer or coarser than the job's resolution.
  const [stepNote, setStepNote] = useState<string | null>(null);
  const panel = useRef<HTMLElement | null>(null);
  const lastBox = useRef<HTMLInputElement | null>(null);
  const gate = useMemo(() => createReadingGate(resolution), [resolution]);

  useEffect(() => setSettings(loadScaleSettings(window.localStorage)), []);
  useEffect(() => {
    const remember = (e: FocusEvent) => {
      if (isWeighCell(e.target as Element)) lastBox.current = e.target as HTMLInputElement;
    };
    document.addEventListener("focusin", remember);
    return () => document.removeEventListener("focusin", remember);
  }, []);

  function change(patch: Partial<ScaleSettings>) {
    setSettings((s) => {
      const next = { ...s, ...patch };
      saveScaleSettings(window.localStorage, next);
      return next;
    });
  }

  /** The box with the cursor; the last one used while the cursor is on this panel. */
  function targetBox(): HTMLInputElement | null {
    const active = document.activeElement;
    if (isWeighCell(active)) return active;
    const last = lastBox.current;
    const away = active === null || active === document.body || panel.current?.contains(active);
    return last?.isConnected && away ? last : null;
  }

  function onReading(reading: ScaleReading, at: number) {
    if (reading.kind === "overload" || reading.kind === "underload") {
      setLive({ kind: reading.kind });
      return;
    }
    if (reading.kind === "error" || reading.value === undefined) {
      if (reading.value !== undefined && reading.note) {
        const refused = readingInJobUnit(reading.value, reading.note, unit);
        if (!refused.ok) return setLive({ kind: "refused", message: refused.message });
      }
      setLive({ kind: "error", text: reading.raw.trim() || reading.note || "" });
      return;
    }
    const inUnit = readingAtJobResolution(reading.value, reading.unit, unit, resolution);
    if (!inUnit.ok) return setLive({ kind: "refused", message: inUnit.message });
    setStepNote(inUnit.note);
    // The figure shown and typed is the job's: at its scale resolution (the display rule).
    const figure =
      `${inUnit.value} ${unit}` +
      (reading.unit && reading.unit !== unit
        ? ` (the scale: ${scaleFigure(reading.value, reading.unit)})`
        : "");
    const decision = gate.offer({ kind: reading.kind, value: inUnit.value }, at);
    if (reading.kind === "unstable") return setLive({ kind: "settling", figure });
    if (inUnit.value.startsWith("-") && decision === "skip")
      return setLive({ kind: "below-zero", figure });
    if (decision === "skip") return setLive({ kind: "empty", figure });
    if (decision === "hold") return setLive({ kind: "held", figure });
    const box = targetBox();
    if (!box || box.readOnly) {
      gate.unused();
      return setLive({ kind: "no-box", figure });
    }
    typeIntoCell(box, inUnit.value, settings.autoAccept);
    setLive({ kind: "entered", figure, into: boxName(box), accepted: settings.autoAccept });
  }

  const { state, granted, connect, disconnect, sendCommand } = useScalePort(onReading);
  const connected = state.status === "connected";
  // A port this browser already has permission for: one click opens it, without the picker.
  const known = rememberedPort(granted, settings.lastPort);

  async function open(port: SerialPort | null) {
    const opened = await connect(settings, port);
    if (!opened) return;
    const { usbVendorId, usbProductId } = opened.getInfo?.() ?? {};
    change({ lastPort: { usbVendorId, usbProductId } });
  }

  return (
    <section
      ref={panel}
      className="panel space-y-3 p-4"
      aria-labelledby="scale-title"
      data-testid="connect-scale"
    >
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="scale-title" className="font-semibold">
          Weights from the scale
        </h2>
        {state.status === "unavailable" ? null : connected ? (
          <span className="flex flex-wrap gap-2">
            {settings.printCommand ? (
              <button
                type="button"
                className="btn-secondary"
                onClick={async () => {
                  gate.askPrint();
                  setCommandMessage(await sendCommand(settings.printCommand));
                  lastBox.current?.focus();
                }}
              >
                Ask the scale for a reading
              </button>
            ) : null}
            <button type="button" className="btn-secondary" onClick={() => void disconnect()}>
              Disconnect
            </button>
          </span>
        ) : known ? (
          <span className="flex flex-wrap gap-2">
            <button
              type="button"
              className="btn-primary"
              disabled={state.status === "connecting"}
              onClick={() => void open(known)}
            >
              Reconnect scale ({settings.baudRate} baud)
            </button>
            <button
              type="button"
              className="btn-secondary"
              disabled={state.status === "connecting"}
              onClick={() => void open(null)}
            >
              Choose another port
            </button>
          </span>
        ) : (
          <button
            type="button"
            className="btn-primary"
            disabled={state.status === "connecting" || state.status === "checking"}
            onClick={() => void open(null)}
          >
            Connect scale
          </button>
        )}
      </div>
      {known && !connected && state.status !== "unavailable" ? (
        <p className="text-sm text-graphite-600" data-testid="scale-remembered">
          This browser already has permission for the scale&apos;s port: Reconnect opens it with the
          settings remembered on this PC ({describePortSettings(settings)}) without asking which
          port. It does not connect on its own when the page opens.
        </p>
      ) : null}

      {state.status === "unavailable" ? (
        <p className="text-sm text-graphite-600" data-testid="scale-unavailable">
          {state.reason} Type the weights as usual; a scale that types into the box (a keyboard
          wedge) works here too.
        </p>
      ) : (
        <>
          <p className="text-sm text-graphite-600">
            Put the cursor in the weigh box for the part and set the part on the pan: the stable
            reading goes into the box, once per part (empty the pan before the next). Settling
            figures, overloads and error lines show here and are never saved. Check the first
            reading against the scale&apos;s own display.
          </p>
          {state.status === "failed" ? (
            <p className="text-sm text-replace" role="alert">
              {state.message}
            </p>
          ) : null}
          {connected ? <LiveReading live={live} unit={unit} /> : null}
          {connected && stepNote ? (
            <p className="text-sm text-graphite-600" data-testid="scale-step-note">
              {stepNote}
            </p>
          ) : null}
          {commandMessage ? <p className="text-sm text-replace">{commandMessage}</p> : null}
          <label className="flex items-center gap-2 text-sm">
            <input
              type="checkbox"
              checked={settings.autoAccept}
              onChange={(e) => change({ autoAccept: e.target.checked })}
            />
            Press Enter for me after a stable reading (saves it and moves to the next box)
          </label>
          <details className="text-sm" open={!connected && state.status !== "checking"}>
            <summary className="cursor-pointer font-semibold">
              Port settings for this PC (as set on the scale)
            </summary>
            <div className="mt-2 flex flex-wrap items-end gap-3">
              {PORT_CHOICES.map((choice) => (
                <PortSelect
                  key={choice.key}
                  choice={choice}
                  settings={settings}
                  disabled={connected}
                  onChange={change}
                />
              ))}
              <label>
                <span className="mb-1 block">Print command (optional)</span>
                <input
                  className="w-28 rounded border border-graphite-300 px-2 py-1.5 font-mono"
                  value={settings.printCommand}
                  maxLength={40}
                  placeholder="P\r\n"
                  onChange={(e) => change({ printCommand: e.target.value })}
                />
              </label>
            </div>
            <p className="mt-1 text-graphite-500">
              The print command is what the scale&apos;s manual says to send for one reading; write
              a carriage return as \r and a line feed as \n.
            </p>
          </details>
        </>
      )}
    </section>
  );
}

function LiveReading({ live, unit }: { live: Live; unit: JobMassUnit }) {
  let figure = "";
  let text: string;
  let tone = "text-graphite-600";
  switch (live.kind) {
    case "waiting":
      text = `Connected. Waiting for the scale (weights in ${unit === "g" ? "grams" : "ounces"}).`;
      break;
    case "settling":
      figure = live.figure;
      text = "settling, not saved";
      break;
    case "empty":
      figure = live.figure;
      text = "pan empty: set the next part on";
      break;
    case "entered":
      figure = live.figure;
      text = live.accepted
        ? `stable: saved in ${live.into}`
        : `stable: in ${live.into}, press Enter to save`;
      tone = "text-within";
      break;
    case "held":
      figure = live.figure;
      text = "stable, already entered: empty the pan before the next part";
      break;
    case "no-box":
      figure = live.figure;
      text = "stable, not used: click the weigh box for this part first";
      tone = "text-machine";
      break;
    case "below-zero":
      figure = live.figure;
      text = "below zero: empty the pan and zero the scale";
      tone = "text-replace";
      break;
    case "overload":
      text = "Over the scale's capacity: take the part off. Not saved.";
      tone = "text-replace";
      break;
    case "underload":
      text = "Below the scale's zero: empty the pan and zero the scale. Not saved.";
      tone = "text-replace";
      break;
    case "error":
      text = `The scale sent "${live.text}". Not saved.`;
      tone = "text-replace";
      break;
    case "refused":
      text = `${live.message} Not saved.`;
      tone = "text-replace";
      break;
  }
  return (
    <output
      className="flex flex-wrap items-baseline gap-3 rounded border border-graphite-200 bg-graphite-50 px-3 py-2"
      aria-live="polite"
      data-testid="scale-live"
      data-kind={live.kind}
    >
      {figure ? <span className="font-mono text-2xl">{figure}</span> : null}
      <span className={`text-sm ${tone}`}>{text}</span>
    </output>
  );
}
