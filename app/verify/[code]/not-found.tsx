import Link from "next/link";

export default function UnknownCardCode() {
  return (
    <>
      <h1 className="text-2xl font-semibold">No card with this code</h1>
      <p>
        No balance card has this verification code. Check the code printed beside the QR code on the
        card (ten letters and digits, such as 7KQ2M-9XW4D) and{" "}
        <Link href="/verify" className="underline">
          try again
        </Link>
        , or ask the shop that issued it.
      </p>
    </>
  );
}
