"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { getDb } from "@/db/client";
import type { MailLogEntry } from "@/db/mail";
import { checkPermission } from "@/lib/auth/guard";
import { type ActionResult, toActionFailure } from "@/lib/http/action-result";
import { retryMail } from "@/lib/mail/send";

const retrySchema = z.object({ mailId: z.coerce.number().int().positive() });

export async function retryMailAction(
  _prev: ActionResult<MailLogEntry> | null,
  form: FormData,
): Promise<ActionResult<MailLogEntry>> {
  const access = await checkPermission("manage-mail");
  if (!access.ok) return { ok: false, status: access.status, message: access.message };
  try {
    const { mailId } = retrySchema.parse({ mailId: form.get("mailId") });
    const mail = await retryMail(getDb(), mailId);
    revalidatePath("/outbox");
    return mail.status === "sent"
      ? { ok: true, data: mail, message: `Sent to ${mail.to}.` }
      : {
          ok: false,
          status: 502,
          message: `Still not sent: ${mail.lastError ?? "no reason given"}`,
        };
  } catch (error) {
    return toActionFailure(error);
  }
}
