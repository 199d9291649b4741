"use client";

export function PrintButton() {
  return (
    <button type="button" className="btn-primary mt-4 print:hidden" onClick={() => window.print()}>
      Print
    </button>
  );
}
