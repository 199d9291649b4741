import { BookingForm } from "@/components/jobs/booking-form";
import { getDb } from "@/db/client";
import { findCounterSettings } from "@/db/counter-settings";
import { requirePagePermission } from "@/lib/auth/guard";

export const metadata = { title: "Book a job in" };

export default async function NewJobPage() {
  await requirePagePermission("book-job", "/jobs/new");
  // A promised date already past is judged on the shop's calendar.
  const { timeZone } = await findCounterSettings(getDb());
  return (
    <section>
      <h1 className="mb-4 text-2xl font-semibold">Book a job in</h1>
      <BookingForm timeZone={timeZone} />
    </section>
  );
}
