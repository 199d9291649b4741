"use client";

import { useCallback, useEffect, useRef, useState } from "react";
import { createScaleDecoder, type ScaleReading } from "@/lib/scale";
import { encodePrintCommand, type ScaleSettings } from "./scale-settings";

export type PortState =
  | { status: "checking" }
  | { status: "unavailable"; reason: string }
  | { status: "idle" }
  | { status: "connecting" }
  | { status: "connected" }
  | { status: "failed"; message: string };

/** Why this page cannot open a serial port, or `null` when it can. */
function serialUnavailableReason(): string | null {
  if (typeof window === "undefined") return null;
  if (!window.isSecureContext)
    return "This page is not on a secure address (https or this PC), so the browser will not open a serial port.";
  if (!("serial" in navigator) || !navigator.serial)
    return "This browser cannot read a scale: reading one needs a Chromium-based browser (Chrome, Edge or Opera) on a desktop PC.";
  return null;
}

/**
 * A scale on a serial port: picked on a click (or, when this browser already has permission for
 * it, opened again without the picker), opened with the bench PC's settings, each line read and
 * handed to `onReading` with the time it arrived.
 */
export function useScalePort(onReading: (reading: ScaleReading, at: number) => void) {
  const [state, setState] = useState<PortState>({ status: "checking" });
  const port = useRef<SerialPort | null>(null);
  const reader = useRef<ReadableStreamDefaultReader<Uint8Array> | null>(null);
  const closing = useRef(false);
  const handler = useRef(onReading);
  useEffect(() => {
    handler.current = onReading;
  });

  // Ports this browser already has permission for (picked on an earlier visit): they open again
  // without the picker.
  const [granted, setGranted] = useState<SerialPort[]>([]);

  useEffect(() => {
    const reason = serialUnavailableReason();
    setState(reason ? { status: "unavailable", reason } : { status: "idle" });
    if (reason || !navigator.serial) return;
    const serial = navigator.serial;
    let live = true;
    const refresh = () =>
      void serial
        .getPorts()
        .then((ports) => {
          if (live) setGranted(ports);
        })
        .catch(() => undefined);
    refresh();
    // A scale plugged in or out while the page is open.
    serial.addEventListener?.("connect", refresh);
    serial.addEventListener?.("disconnect", refresh);
    return () => {
      live = false;
      serial.removeEventListener?.("connect", refresh);
      serial.removeEventListener?.("disconnect", refresh);
    };
  }, []);

  const readLoop = useCallback(async (open: SerialPort) => {
    const decoder = createScaleDecoder();
    // After a framing or parity error the port gives a fresh stream; when the scale is
    // unplugged it gives none.
    let ended = false;
    while (open.readable && !closing.current && !ended) {
      const r = open.readable.getReader();
      reader.current = r;
      try {
        for (;;) {
          const { value, done } = await r.read();
          if (done) {
            ended = true;
            break;
          }
          for (const reading of decoder.push(value)) handler.current(reading, Date.now());
        }
      } catch {
        if (!closing.current)
          handler.current(
            {
              kind: "error",
              note: "the line was garbled: check the baud rate, data bits, parity and stop bits",
              raw: "",
            },
            Date.now(),
          );
      } finally {
        r.releaseLock();
        reader.current = null;
      }
    }
    for (const reading of decoder.flush()) handler.current(reading, Date.now());
    if (!closing.current) {
      port.current = null;
      await open.close().catch(() => undefined);
      setState({ status: "failed", message: "The scale was disconnected. Connect it again." });
    }
  }, []);

  /**
   * Opens the scale's port with `settings`: `known`, a port this browser already has permission
   * for, opens without the picker; otherwise the browser's picker asks which port. Resolves to
   * the port opened, or null.
   */
  const connect = useCallback(
    async (settings: ScaleSettings, known?: SerialPort | null): Promise<SerialPort | null> => {
      if (!navigator.serial) return null;
      setState({ status: "connecting" });
      let picked: SerialPort;
      try {
        picked = known ?? (await navigator.serial.requestPort());
      } catch {
        setState({ status: "idle" }); // the machinist closed the picker
        return null;
      }
      try {
        await picked.open({
          baudRate: settings.baudRate,
          dataBits: settings.dataBits,
          parity: settings.parity,
          stopBits: settings.stopBits,
          flowControl: settings.flowControl,
        });
      } catch (error) {
        setState({
          status: "failed",
          message: `The port would not open${error instanceof Error && error.message ? ` (${error.message})` : ""}: is another program or tab using the scale?`,
        });
        return null;
      }
      closing.current = false;
      port.current = picked;
      setGranted((ports) => (ports.includes(picked) ? ports : [...ports, picked]));
      setState({ status: "connected" });
      void readLoop(picked);
      return picked;
    },
    [readLoop],
  );

  const disconnect = useCallback(async () => {
    const open = port.current;
    if (!open) return;
    closing.current = true;
    port.current = null;
    await reader.current?.cancel().catch(() => undefined);
    await open.close().catch(() => undefined);
    setState({ status: "idle" });
  }, []);

  /** Sends the print command; a message when it cannot. */
  const sendCommand = useCallback(async (command: string): Promise<string | null> => {
    const bytes = encodePrintCommand(command);
    if (!bytes || bytes.length === 0)
      return "Write the print command with \\r, \\n or \\xHH for control characters, like P\\r\\n.";
    const writable = port.current?.writable;
    if (!writable) return "Connect the scale first.";
    const writer = writable.getWriter();
    try {
      await writer.write(bytes);
      return null;
    } catch {
      return "The print command could not be sent.";
    } finally {
      writer.releaseLock();
    }
  }, []);

  useEffect(
    () => () => {
      closing.current = true;
      void reader.current?.cancel().catch(() => undefined);
      void port.current?.close().catch(() => undefined);
    },
    [],
  );

  return { state, granted, connect, disconnect, sendCommand };
}
