"use client";

/**
 * The photos of a section at the foot of a screen whose first concern is elsewhere (the traverse
 * screen): the same card, its code fetched after the page is up instead of with it.
 */
import { laterPart } from "@/components/ui/later-part";

export const SectionPhotosLater = laterPart(() => import("./section-photos"), (m) => m.SectionPhotos, {
  loading: "Loading the photos…",
  unavailable: "The photos could not be loaded without network; reload the page when the connection returns to see them.",
});
