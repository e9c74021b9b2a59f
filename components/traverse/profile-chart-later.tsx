"use client";

/** The velocity profile chart (chart.js), fetched after the page is up (later-parts.ts). */
import { laterPart } from "@/components/ui/later-part";
import { loadChart } from "./later-parts";

export const ProfileChartLater = laterPart(loadChart, (m) => m.ProfileChart, {
  loading: "Loading the profile chart…",
  unavailable: "The profile chart could not be loaded without network. The map and the grid show the same values; reload the page when the connection returns to see the chart.",
});
