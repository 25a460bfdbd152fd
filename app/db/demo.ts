import type { Role } from "./schema";

/**
 * The invented demo scenario: Kestrel Fieldworks certifying its KF-60 Tern twin-turboprop commuter,
 * and an unrelated organisation, Northmoor Aerostructures, whose user shows that organisations are
 * isolated from each other. These passwords exist only for local demonstration.
 */
export const DEMO_ORGANISATIONS = {
  kestrel: { slug: "kestrel-fieldworks", name: "Kestrel Fieldworks" },
  northmoor: { slug: "northmoor-aerostructures", name: "Northmoor Aerostructures" },
} as const;

export interface DemoUser {
  label: "engineer" | "checker" | "quality" | "admin" | "outsider";
  name: string;
  email: string;
  password: string;
  organisation: keyof typeof DEMO_ORGANISATIONS;
  roles: Role[];
}

export const DEMO_USERS: readonly DemoUser[] = [
  { label: "engineer", name: "Erin Hale", email: "erin.hale@kestrel-fieldworks.example", password: "tern-engineer-2026", organisation: "kestrel", roles: ["engineer"] },
  { label: "checker", name: "Marek Oduya", email: "marek.oduya@kestrel-fieldworks.example", password: "tern-checker-2026", organisation: "kestrel", roles: ["checker"] },
  { label: "quality", name: "Priya Lindqvist", email: "priya.lindqvist@kestrel-fieldworks.example", password: "tern-quality-2026", organisation: "kestrel", roles: ["quality"] },
  { label: "admin", name: "Sam Okafor", email: "sam.okafor@kestrel-fieldworks.example", password: "tern-admin-2026", organisation: "kestrel", roles: ["admin"] },
  { label: "outsider", name: "Jonas Reyes", email: "jonas.reyes@northmoor-aero.example", password: "skua-engineer-2026", organisation: "northmoor", roles: ["engineer", "admin"] },
];

export const DEMO_PROGRAMMES = [
  {
    organisation: "kestrel",
    code: "KF60",
    name: "KF-60 Tern type certification",
    aircraft: "KF-60 Tern, twin-turboprop commuter, 6 350 kg MTOW",
    description: "Wing loads for the initial type certificate.",
  },
  {
    organisation: "northmoor",
    code: "NA14",
    name: "NA-14 Skua wing redesign",
    aircraft: "NA-14 Skua, single-engine utility aeroplane",
    description: "Northmoor's own programme; Kestrel users must never see it.",
  },
] as const;

export const DEMO_CASES = [
  { programme: "KF60", reference: "TN-WL-001", title: "Wing loads, initial type certificate", description: "Manoeuvre and gust envelope of the KF-60 Tern wing, flaps up." },
  { programme: "KF60", reference: "TN-WL-002", title: "Wing loads, increased MTOW study", description: "Empty case: the blank path for a new study." },
  { programme: "NA14", reference: "SK-L-07", title: "Outer wing loads", description: "Northmoor's case." },
] as const;
