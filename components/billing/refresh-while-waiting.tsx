"use client";

import { useRouter } from "next/navigation";
import { useEffect } from "react";

/** Re-reads the page every two seconds for half a minute, while a payment notice is awaited. */
export function RefreshWhileWaiting({
  everyMs = 2000,
  times = 15,
}: {
  everyMs?: number;
  times?: number;
}) {
  const router = useRouter();
  useEffect(() => {
    let count = 0;
    const timer = setInterval(() => {
      count += 1;
      router.refresh();
      if (count >= times) clearInterval(timer);
    }, everyMs);
    return () => clearInterval(timer);
  }, [router, everyMs, times]);
  return null;
}
