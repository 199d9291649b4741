// @vitest-environment jsdom
import { act, cleanup, render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { type KeyboardEvent, useRef, useState } from "react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { ConnectScale } from "@/components/scale/connect-scale";
import { rememberedPort, SCALE_SETTINGS_KEY } from "@/components/scale/scale-settings";

/** A serial port whose bytes the test sends; what the page writes is kept. */
function installFakeSerial(options: { granted?: boolean } = {}) {
  let feed!: ReadableStreamDefaultController<Uint8Array>;
  const written: number[][] = [];
  const port = {
    readable: new ReadableStream<Uint8Array>({
      start(c) {
        feed = c;
      },
    }),
    writable: new WritableStream<Uint8Array>({
      write(chunk) {
        written.push([...chunk]);
      },
    }),
    open: vi.fn(async () => undefined),
    close: vi.fn(async () => undefined),
    // An invented USB-serial adapter's ids.
    getInfo: () => ({ usbVendorId: 0x1a2b, usbProductId: 0x0c0d }),
  };
  const serial = {
    requestPort: vi.fn(async () => port),
    getPorts: vi.fn(async () => (options.granted ? [port] : [])),
  };
  Object.defineProperty(navigator, "serial", { value: serial, configurable: true });
  const encoder = new TextEncoder();
  return {
    port,
    serial,
    written,
    /** Sends text from the scale in the chunks given. */
    send: async (...chunks: string[]) => {
      for (const chunk of chunks)
        await act(async () => {
          feed.enqueue(encoder.encode(chunk));
          await new Promise((r) => setTimeout(r, 0));
        });
    },
  };
}

/** Two weigh boxes that behave like the grid's: a controlled value, Enter saves and moves on. */
function Bench({ unit = "g" as const }: { unit?: "g" | "oz" }) {
  const [values, setValues] = useState(["", ""]);
  const [saved, setSaved] = useState<string[]>([]);
  const boxes = useRef<(HTMLInputElement | null)[]>([]);
  const onKeyDown = (i: number) => (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key !== "Enter") return;
    setSaved((s) => [...s, `${i + 1}:${values[i]}`]);
    boxes.current[i + 1]?.focus();
  };
  return (
    <>
      <ConnectScale unit={unit} resolution="0.1" />
      <table data-testid="weigh-grid">
        <tbody>
          <tr>
            {[0, 1].map((i) => (
              <td key={i}>
                <input
                  ref={(el) => {
                    boxes.current[i] = el;
                  }}
                  aria-label={`Cylinder ${i + 1} Piston, ${unit}`}
                  value={values[i]}
                  onChange={(e) =>
                    setValues((v) => v.map((x, j) => (j === i ? e.target.value : x)))
                  }
                  onKeyDown={onKeyDown(i)}
                />
              </td>
            ))}
          </tr>
        </tbody>
      </table>
      <p data-testid="saved">{saved.join(" | ")}</p>
      <button type="button">Elsewhere</button>
    </>
  );
}

const live = () => screen.getByTestId("scale-live");
const box = (n: number) => screen.getByLabelText(new RegExp(`Cylinder ${n} Piston`));

beforeEach(() => {
  Object.defineProperty(window, "isSecureContext", { value: true, configurable: true });
  window.localStorage.clear();
});
afterEach(() => {
  cleanup();
  // @ts-expect-error the fake is removed again
  delete navigator.serial;
});

describe("Connect scale", () => {
  it("says why where the browser has no serial port, and typing stays", () => {
    render(<Bench />);
    expect(screen.getByTestId("scale-unavailable").textContent).toMatch(/Chromium-based browser/);
    expect(screen.queryByRole("button", { name: "Connect scale" })).toBeNull();
    expect(box(1)).not.toHaveProperty("readOnly", true);
  });

  it("says why on an address that is not secure", () => {
    installFakeSerial();
    Object.defineProperty(window, "isSecureContext", { value: false, configurable: true });
    render(<Bench />);
    expect(screen.getByTestId("scale-unavailable").textContent).toMatch(/secure address/);
  });

  it("opens the picked port with the settings this PC remembered", async () => {
    window.localStorage.setItem(
      SCALE_SETTINGS_KEY,
      JSON.stringify({ baudRate: 2400, dataBits: 7, parity: "even", stopBits: 2 }),
    );
    const fake = installFakeSerial();
    render(<Bench />);
    await userEvent.click(await screen.findByRole("button", { name: "Connect scale" }));
    await waitFor(() => expect(fake.port.open).toHaveBeenCalled());
    expect(fake.serial.requestPort).toHaveBeenCalledTimes(1);
    expect(fake.port.open).toHaveBeenCalledWith({
      baudRate: 2400,
      dataBits: 7,
      parity: "even",
      stopBits: 2,
      flowControl: "none",
    });
  });

  it("reopens a port this browser already has permission for without the picker", async () => {
    window.localStorage.setItem(
      SCALE_SETTINGS_KEY,
      JSON.stringify({ baudRate: 4800, dataBits: 7, parity: "even", stopBits: 1 }),
    );
    const fake = installFakeSerial({ granted: true });
    render(<Bench />);
    expect((await screen.findByTestId("scale-remembered")).textContent).toContain(
      "4800 baud, 7 data bits, even parity, 1 stop bit",
    );
    expect(screen.queryByRole("button", { name: "Connect scale" })).toBeNull();
    await userEvent.click(screen.getByRole("button", { name: "Reconnect scale (4800 baud)" }));
    await waitFor(() => expect(fake.port.open).toHaveBeenCalled());
    expect(fake.serial.requestPort).not.toHaveBeenCalled();
    expect(fake.port.open).toHaveBeenCalledWith({
      baudRate: 4800,
      dataBits: 7,
      parity: "even",
      stopBits: 1,
      flowControl: "none",
    });
    await screen.findByText(/Waiting for the scale/);
  });

  it("keeps the port picked on this PC, to find it again next time", async () => {
    installFakeSerial();
    render(<Bench />);
    await userEvent.click(await screen.findByRole("button", { name: "Connect scale" }));
    await screen.findByText(/Waiting for the scale/);
    expect(JSON.parse(window.localStorage.getItem(SCALE_SETTINGS_KEY) ?? "{}")).toMatchObject({
      lastPort: { usbVendorId: 0x1a2b, usbProductId: 0x0c0d },
    });
  });

  it("remembers a changed setting on this PC", async () => {
    installFakeSerial();
    render(<Bench />);
    await userEvent.selectOptions(await screen.findByLabelText("Baud rate"), "19200");
    expect(JSON.parse(window.localStorage.getItem(SCALE_SETTINGS_KEY) ?? "{}")).toMatchObject({
      baudRate: 19200,
    });
  });

  it("shows settling and overload lines without saving them, then types the stable reading once", async () => {
    const fake = installFakeSerial();
    render(<Bench />);
    await userEvent.click(await screen.findByRole("button", { name: "Connect scale" }));
    await screen.findByText(/Waiting for the scale/);
    box(1).focus();
    await fake.send("S D     312.48 g\r\n", "S D     498.71 g\r\n");
    expect(live().dataset.kind).toBe("settling");
    // Shown at the job's 0.1 g: 498.71 rounds to 498.7 (formatMass, halves away from zero).
    expect(live().textContent).toContain("498.7 g");
    expect(live().textContent).not.toContain("498.71");
    expect(box(1)).toHaveProperty("value", "");
    await fake.send("S +\r\n");
    expect(live().textContent).toMatch(/Over the scale's capacity/);
    expect(box(1)).toHaveProperty("value", "");
    // The stable line arrives in three chunks, the CRLF itself split.
    await fake.send("S S     49", "8.60 g\r", "\n");
    expect(box(1)).toHaveProperty("value", "498.6");
    // Said once in the panel: the scale prints 0.01 g, the job records 0.1 g.
    expect(screen.getAllByTestId("scale-step-note")).toHaveLength(1);
    expect(screen.getByTestId("scale-step-note").textContent).toContain(
      "The scale reads to 0.01 g; this job records to 0.1 g",
    );
    expect(live().textContent).toMatch(/stable: in cylinder 1 piston, press Enter to save/);
    // The scale repeats the weight while the part sits on the pan: entered once.
    await fake.send("S S     498.60 g\r\n", "S S     498.60 g\r\n");
    expect(box(1)).toHaveProperty("value", "498.6");
    expect(screen.getAllByTestId("scale-step-note")).toHaveLength(1);
    expect(live().textContent).toMatch(/already entered: empty the pan/);
    expect(screen.getByTestId("saved").textContent).toBe("");
  });

  it("with Enter pressed for the machinist, each part goes in and the cursor moves on", async () => {
    const fake = installFakeSerial();
    render(<Bench />);
    await userEvent.click(await screen.findByLabelText(/Press Enter for me/));
    await userEvent.click(screen.getByRole("button", { name: "Connect scale" }));
    await screen.findByText(/Waiting for the scale/);
    box(1).focus();
    await fake.send("ST,GS,+00498.60  g\r\n", "ST,GS,+00498.60  g\r\n");
    await fake.send("US,GS,+00000.20  g\r\n", "ST,GS,+00512.30  g\r\n");
    expect(screen.getByTestId("saved").textContent).toBe("1:498.6 | 2:512.3");
  });

  it("converts a reading in ounces for a job in grams (17.500 oz = 496.1 g at 0.1 g)", async () => {
    // By hand: 17.5 × 28.349523125 = 496.1166546875 g (NIST Handbook 44 App. C), at the job's
    // 0.1 g → 496.1. The scale's step 0.001 oz is 0.028 g, finer than the job's 0.1 g.
    const fake = installFakeSerial();
    render(<Bench />);
    await userEvent.click(await screen.findByRole("button", { name: "Connect scale" }));
    await screen.findByText(/Waiting for the scale/);
    box(1).focus();
    await fake.send("+   17.500 oz   \r\n");
    expect(box(1)).toHaveProperty("value", "496.1");
    expect(live().textContent).toContain("496.1 g (the scale: 17.500 oz)");
    expect(screen.getByTestId("scale-step-note").textContent).toContain(
      "The scale reads to 0.001 oz (0.028 g); this job records to 0.1 g",
    );
  });

  it("says where the scale reads coarser than the job, and nothing where they match", async () => {
    const fake = installFakeSerial();
    render(<Bench />);
    await userEvent.click(await screen.findByRole("button", { name: "Connect scale" }));
    await screen.findByText(/Waiting for the scale/);
    box(1).focus();
    await fake.send("S D     498.6 g\r\n");
    expect(screen.queryByTestId("scale-step-note")).toBeNull();
    await fake.send("S D     499 g\r\n");
    expect(live().textContent).toContain("499.0 g");
    expect(screen.getByTestId("scale-step-note").textContent).toContain(
      "The scale reads to 1 g; this job records to 0.1 g",
    );
  });

  it("refuses a count and names it; a reading with no box to go into is not lost", async () => {
    const fake = installFakeSerial();
    render(<Bench />);
    await userEvent.click(await screen.findByRole("button", { name: "Connect scale" }));
    await screen.findByText(/Waiting for the scale/);
    await fake.send("S S      12 pcs\r\n");
    expect(live().textContent).toMatch(/The scale sent "pcs", not a weight/);
    box(1).focus();
    screen.getByRole("button", { name: "Elsewhere" }).focus(); // the cursor left the grid
    await fake.send("S S     498.60 g\r\n");
    expect(live().textContent).toMatch(/click the weigh box for this part first/);
    box(2).focus();
    await fake.send("S S     498.60 g\r\n");
    expect(box(2)).toHaveProperty("value", "498.6");
  });

  it("sends the print command on request, control characters written as \\r\\n", async () => {
    window.localStorage.setItem(SCALE_SETTINGS_KEY, JSON.stringify({ printCommand: "P\\r\\n" }));
    const fake = installFakeSerial();
    render(<Bench />);
    await userEvent.click(await screen.findByRole("button", { name: "Connect scale" }));
    await userEvent.click(
      await screen.findByRole("button", { name: "Ask the scale for a reading" }),
    );
    await waitFor(() => expect(fake.written).toEqual([[0x50, 0x0d, 0x0a]]));
  });
});

describe("which granted port is the scale", () => {
  const port = (usbVendorId?: number, usbProductId?: number) => ({
    getInfo: () => ({ usbVendorId, usbProductId }),
  });

  it("is the one with the remembered USB ids among several", () => {
    const ports = [port(1, 2), port(0x1a2b, 0x0c0d), port(3, 4)];
    expect(rememberedPort(ports, { usbVendorId: 0x1a2b, usbProductId: 0x0c0d })).toBe(ports[1]);
  });

  it("is the only one there is, and none when several could be it", () => {
    const only = [port(5, 6)];
    expect(rememberedPort(only, { usbVendorId: 0x1a2b, usbProductId: 0x0c0d })).toBe(only[0]);
    expect(rememberedPort(only, null)).toBe(only[0]);
    expect(rememberedPort([port(1, 2), port(3, 4)], null)).toBeNull();
    expect(rememberedPort([], null)).toBeNull();
  });
});
