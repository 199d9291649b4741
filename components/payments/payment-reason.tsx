import type { ReactNode } from "react";
import { unappliedReasonText } from "@/lib/payments/reasons";

/**
 * Why an online payment was kept to reconcile, in words, with the payment service's reference
 * when there is one; `children` follows on the same line (a link to the full list).
 */
export function PaymentReason({
  reason,
  reference,
  children,
}: {
  reason: string;
  reference: string | null;
  children?: ReactNode;
}) {
  return (
    <p className="text-sm text-graphite-700">
      {unappliedReasonText(reason)}
      {reference ? (
        <>
          {" "}
          Payment service reference: <span className="font-mono">{reference}</span>.
        </>
      ) : null}
      {children ? <> {children}</> : null}
    </p>
  );
}
