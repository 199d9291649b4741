"use client";

import { useMutation } from "@tanstack/react-query";
import { useId, useState } from "react";
import { ApiError, apiFetch } from "@/lib/api-client";
import { shopDateTime } from "@/lib/dates/shop-time";

type Outcome = { ok: boolean; message: string } | null;

interface InviteResponse {
  invite: { email: string; expiresAt: string };
  mail?: { status: "queued" | "sent" | "failed"; lastError: string | null };
}

/**
 * For a customer record: e-mails the customer a one-time link to set a password, after which
 * they can sign in and follow their own jobs. The counter and the owner may send it.
 */
export function InviteCustomerButton({
  customerId,
  email,
  timeZone,
}: {
  customerId: number;
  email: string | null;
  /** The shop's time zone (IANA name): the link's end is given on the shop's clock. */
  timeZone: string;
}) {
  const id = useId();
  const [open, setOpen] = useState(false);
  const [address, setAddress] = useState(email ?? "");
  const [outcome, setOutcome] = useState<Outcome>(null);
  const [fieldError, setFieldError] = useState<string>();

  const invite = useMutation({
    mutationFn: () =>
      apiFetch<InviteResponse>("/api/invites", {
        method: "POST",
        body: { customerId, email: address.trim() || undefined },
      }),
    onMutate: () => {
      setOutcome(null);
      setFieldError(undefined);
    },
    onError: (e) => {
      setFieldError(e instanceof ApiError ? e.fields.email : undefined);
      setOutcome({
        ok: false,
        message: e instanceof ApiError ? e.message : "The invite could not be made.",
      });
    },
    onSuccess: (body) => {
      const until = shopDateTime(body.invite.expiresAt, timeZone);
      setOutcome(
        body.mail?.status === "sent"
          ? {
              ok: true,
              message: `Invite e-mailed to ${body.invite.email}. The link works until ${until}.`,
            }
          : {
              ok: false,
              message: `The invite was made but the e-mail did not go (${body.mail?.lastError ?? "no reason given"}). The owner can send it again from the Mail outbox.`,
            },
      );
      if (body.mail?.status === "sent") setOpen(false);
    },
  });
  const pending = invite.isPending;

  return (
    <div className="space-y-2" data-testid="invite-customer">
      {open ? (
        <form
          className="flex flex-wrap items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            invite.mutate();
          }}
          noValidate
        >
          <div className="min-w-64 flex-1">
            <label htmlFor={`${id}-email`} className="mb-1 block text-sm font-semibold">
              Send the invite to
            </label>
            <input
              id={`${id}-email`}
              type="email"
              className="field-input"
              value={address}
              onChange={(e) => setAddress(e.target.value)}
              aria-invalid={fieldError ? true : undefined}
              aria-describedby={fieldError ? `${id}-email-error` : undefined}
              required
            />
            {fieldError ? (
              <p id={`${id}-email-error`} className="mt-1 text-sm text-replace">
                {fieldError}
              </p>
            ) : null}
          </div>
          <button type="submit" className="btn-primary" disabled={pending}>
            {pending ? "Sending…" : "Send invite"}
          </button>
          <button type="button" className="btn-secondary" onClick={() => setOpen(false)}>
            Cancel
          </button>
        </form>
      ) : (
        <button type="button" className="btn-secondary" onClick={() => setOpen(true)}>
          Invite to sign in
        </button>
      )}
      <div aria-live="polite" className="min-h-5 text-sm">
        {outcome ? (
          <p className={outcome.ok ? "text-within" : "text-replace"}>{outcome.message}</p>
        ) : null}
      </div>
    </div>
  );
}
