"use client";

import { useEffect, useState } from "react";

const pad = (n: number) => String(n).padStart(2, "0");

/** The phone's own calendar date, ISO 'YYYY-MM-DD'. */
export function localIsoDate(d: Date): string {
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

// Today's date on the phone. For views rendered in the browser only (the server does not know the
// phone's time zone).
export function useToday(): string {
  const [today, setToday] = useState(() => localIsoDate(new Date()));
  useEffect(() => {
    // A phone left open overnight moves to the new day.
    const timer = window.setInterval(() => setToday(localIsoDate(new Date())), 60_000);
    return () => window.clearInterval(timer);
  }, []);
  return today;
}
