/** The weigh boxes the scale may type into: inputs of the weigh-in grid. */
export const WEIGH_GRID_SELECTOR = '[data-testid="weigh-grid"]';

export function isWeighCell(el: Element | null | undefined): el is HTMLInputElement {
  return el instanceof HTMLInputElement && el.closest(WEIGH_GRID_SELECTOR) !== null;
}

/**
 * Types a reading into a weigh box as the machinist would: after what is there (a repeated
 * reading), through the input event the form listens to, then Enter when asked.
 */
export function typeIntoCell(input: HTMLInputElement, text: string, pressEnter: boolean) {
  input.focus();
  const before = input.value.trim();
  const setValue = Object.getOwnPropertyDescriptor(HTMLInputElement.prototype, "value")?.set;
  setValue?.call(input, before ? `${before} ${text}` : text);
  input.dispatchEvent(new Event("input", { bubbles: true }));
  if (pressEnter)
    input.dispatchEvent(
      new KeyboardEvent("keydown", {
        key: "Enter",
        code: "Enter",
        bubbles: true,
        cancelable: true,
      }),
    );
}
