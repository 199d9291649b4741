import { BookingForm } from "@/components/jobs/booking-form";
import { requirePageUser } from "@/lib/auth/guard";

export const metadata = { title: "Book a job in" };

export default async function NewJobPage() {
  await requirePageUser(["owner", "counter"], "/jobs/new");
  return (
    <section>
      <h1 className="mb-4 text-2xl font-semibold">Book a job in</h1>
      <BookingForm />
    </section>
  );
}
