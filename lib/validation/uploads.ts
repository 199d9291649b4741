import { z } from "zod";
import { UPLOAD_CATEGORIES } from "@/db/uploads-schema";

export const uploadCategoryField = z.enum(UPLOAD_CATEGORIES, {
  message: "Choose arrival photo, balancer printout or other.",
});

export const captionField = z
  .string()
  .trim()
  .max(200, "Use at most 200 characters.")
  .transform((v) => v || null);

/** The fields sent with a file (multipart form); the file itself is checked by its content. */
export const uploadFormSchema = z.object({
  file: z.instanceof(File, { message: "Choose a file to attach." }),
  category: uploadCategoryField.default("other"),
  caption: captionField.nullish().transform((v) => v ?? null),
});
export type UploadFormInput = z.infer<typeof uploadFormSchema>;

/** `?download=1` offers the file as a download instead of showing it. */
export const uploadReadQuerySchema = z.object({
  download: z
    .enum(["0", "1"])
    .optional()
    .transform((v) => v === "1"),
});
