/**
 * The site-safety reminders shown wherever readings are taken and in every report. They defer to the
 * site's rules, local codes and licensed practice; Airtally does not replace a site induction.
 */

export type HazardId = "ports" | "height" | "rotating" | "hot";

export interface Hazard {
  id: HazardId;
  /** A few words, for a tile's heading. */
  title: string;
  /** The reminder, one or two sentences. */
  text: string;
}

export const HAZARDS: readonly Hazard[] = [
  {
    id: "ports",
    title: "Test ports",
    text: "Before drilling test ports, check for services and wiring behind the duct wall and for hazardous material in old insulation or lining; plug every port afterwards with a proper seal.",
  },
  {
    id: "height",
    title: "Ladders and work at height",
    text: "Work at height from a secured ladder or platform, following the site's access rules.",
  },
  {
    id: "rotating",
    title: "Fans and belts",
    text: "Before opening an access door near a fan or its belts, lock out and tag out the drive: rotating equipment can start without warning.",
  },
  {
    id: "hot",
    title: "Hot and energised equipment",
    text: "Hot ducts, steam coils and energised panels: keep clear, or work with the people licensed for them.",
  },
];

/** The reminders as plain sentences (reports, exports). */
export const SAFETY_CAUTIONS: readonly string[] = HAZARDS.map((h) => h.text);

export const SAFETY_FOOTNOTE = "Results are for the engineer of record's review. Site rules, local codes and licensed practice govern.";
