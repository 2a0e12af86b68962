"use client";

import dynamic from "next/dynamic";
import { ReadingPlaceholder } from "./reading-placeholder";

// Today and the digs list render in the browser only (their data is on the phone, not the server), and
// their database code loads after the page is interactive.
export const TodayView = dynamic(() => import("./today-view").then((m) => m.TodayView), {
  ssr: false,
  loading: ReadingPlaceholder,
});

export const DigsView = dynamic(() => import("./digs-view").then((m) => m.DigsView), {
  ssr: false,
  loading: ReadingPlaceholder,
});
