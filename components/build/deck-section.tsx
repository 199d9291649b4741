"use client";

import { formatCc, formatLengthAsTyped, formatRatio } from "@/lib/build-record/format";
import type { BuildRecordData } from "@/lib/build-record/schemas";
import { bindSection, BuildPanel, Cell, StackCell, StackRow, StackTable, typed } from "./cells";
import { type SectionProps, upsertRow } from "./use-build-record";

type DeckRow = BuildRecordData["deck"]["rows"][number];

/**
 * Deck clearance and compression ratio per cylinder (a row made when a figure is typed), with
 * the quench and clearance volume worked out.
 */
export function DeckSection(props: SectionProps) {
  const { editor, results, cylinders } = props;
  const b = bindSection(props, "deck");
  const { data } = editor;
  const specs = data.specs;
  const setDeck = (c: number, change: Partial<DeckRow>) =>
    editor.update("deck", (s) => ({
      rows: upsertRow(
        s.rows,
        (r) => r.cylinder === c,
        { cylinder: c, deckClearance: null, chamberCc: null },
        (row) => ({ ...row, ...change }),
        (r) => !!(r.deckClearance || r.chamberCc),
      ),
    }));

  return (
    <BuildPanel
      {...b.panel}
      title="Deck clearance and compression ratio"
      note="Deck clearance measured at TDC with a dial indicator: piston below the deck positive, above it negative. A chamber volume typed here replaces the engine's for that cylinder."
    >
      <StackTable
        head={
          <tr className="text-left text-graphite-500">
            <th className="pr-3 font-semibold">Cyl</th>
            <th className="pr-3 font-semibold">Deck clearance ({specs.lengthUnit})</th>
            <th className="pr-3 font-semibold">Chamber (cc)</th>
            <th className="pr-3 font-semibold">Quench ({specs.lengthUnit})</th>
            <th className="pr-3 font-semibold">Clearance volume</th>
            <th className="pr-3 font-semibold">Compression ratio</th>
          </tr>
        }
      >
        {cylinders.map((c) => {
          const i = data.deck.rows.findIndex((r) => r.cylinder === c);
          const row = i >= 0 ? data.deck.rows[i] : undefined;
          const r = i >= 0 ? results.deck[i] : undefined;
          return (
            <StackRow key={c} title={`Cylinder ${c}`} data-testid={`deck-${c}`}>
              <StackCell deskOnly className="pr-3 font-mono">
                {c}
              </StackCell>
              <StackCell label={`Deck clearance (${specs.lengthUnit})`} className="py-0.5 pr-3">
                <Cell
                  label={`Cylinder ${c} deck clearance`}
                  inputMode="text"
                  value={row?.deckClearance ?? null}
                  onChange={(v) => setDeck(c, { deckClearance: typed(v) })}
                  onCommit={b.commit}
                  error={b.error(`rows.${i}.deckClearance`)}
                  {...b.ro}
                />
              </StackCell>
              <StackCell label="Chamber (cc)" className="py-0.5 pr-3">
                <Cell
                  label={`Cylinder ${c} chamber volume`}
                  value={row?.chamberCc ?? null}
                  placeholder={specs.compression.chamberCc ?? undefined}
                  onChange={(v) => setDeck(c, { chamberCc: typed(v) })}
                  onCommit={b.commit}
                  error={b.error(`rows.${i}.chamberCc`)}
                  {...b.ro}
                />
              </StackCell>
              <StackCell label={`Quench (${specs.lengthUnit})`} className="pr-3 font-mono">
                {r?.quench
                  ? formatLengthAsTyped(r.quench, [
                      row?.deckClearance,
                      specs.compression.gasketThickness,
                    ])
                  : ""}
              </StackCell>
              <StackCell label="Clearance volume" className="pr-3 font-mono">
                {r?.result?.ok ? `${formatCc(r.result.value.clearanceCc)} cc` : ""}
              </StackCell>
              <StackCell
                label="Compression ratio"
                className="pr-3 font-mono"
                data-testid={`deck-ratio-${c}`}
              >
                {!r?.result
                  ? ""
                  : r.result.ok
                    ? formatRatio(r.result.value.ratio)
                    : r.result.refusal.message}
              </StackCell>
            </StackRow>
          );
        })}
      </StackTable>
    </BuildPanel>
  );
}
