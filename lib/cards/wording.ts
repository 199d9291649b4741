// The card's fixed wording, shared by the PDF, the job page and the public verification page.

/** The cautions every balance card and verification page carries (the usual cautions of the trade). */
export const CARD_CAUTIONS = [
  "Balancing figures are only as good as the scale and the balancer: this card names the scale and its resolution, and the balancer used where the shop named it.",
  "A rotating assembly that fails at speed can kill. Follow the engine maker's figures, the balancing machine's instructions and local codes and licensed practice, and wear eye protection when machining.",
  "The computed figures support, not replace, the machinist's judgement.",
] as const;

/** Printed in place of bobweight figures for layouts that need none. */
export const NO_BOBWEIGHT_TEXT = "No bobweight needed: this layout is balanced without bobweights";
