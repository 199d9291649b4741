import { z } from "zod";
import { isTimeZone } from "@/lib/dates/shop-time";
import { CUSTOMER_MAIL_KINDS } from "@/lib/mail/templates";

const optionalText = (label: string, max: number) =>
  z
    .string({ message: `${label}: text, or leave it blank.` })
    .trim()
    .max(max, `${label}: at most ${max} characters.`)
    .nullable()
    .optional()
    .transform((v) => v || null);

/** The owner's settings for the shop's e-mails and its time zone, shared by form and server. */
export const counterSettingsSchema = z
  .object({
    version: z.number().int().min(0),
    senderName: optionalText("Sender name", 80).refine(
      (v) => v === null || !/[<>"\r\n]/.test(v),
      "Sender name: letters, digits and spaces, without < > or quotes.",
    ),
    replyTo: z
      .union([
        z.literal(""),
        z.null(),
        z.email({ message: "Replies go to: enter an e-mail address like desk@your-shop.example." }),
      ])
      .optional()
      .transform((v) => v || null),
    signature: optionalText("Signature", 600),
    mailOff: z
      .array(z.enum(CUSTOMER_MAIL_KINDS, { message: "Not a kind of message." }))
      .max(CUSTOMER_MAIL_KINDS.length),
    timeZone: z
      .string({ message: "Time zone: choose the shop's, like America/Denver." })
      .trim()
      .refine(isTimeZone, "Time zone: choose the shop's from the list, like America/Denver."),
  })
  .strict();
export type CounterSettingsWrite = z.output<typeof counterSettingsSchema>;
