// Span and marking details and lighting options for the invented demo crossings. Every figure
// here is made up for the demo scenario; option prices start from lib/costs' invented defaults.
import { Crossing, LightingOption, User } from "../../db/models";
import type { InstallationMethod, OptionKind } from "../../shared/cost-schemas";
import { crossingDetailsSchema } from "../../shared/crossing-details-schemas";
import { lightingOptionFormSchema, type LightingOptionValues } from "../../shared/lighting-option-schemas";
import { db } from "../utils/db.server";
import { updateCrossingDetails } from "./crossing-marking.server";
import { createOption, newOptionValues, optionFormContext } from "./lighting-options.server";

interface DemoOption {
  kind: OptionKind;
  method?: InstallationMethod;
  name: string;
  feasibility?: { status: "go" | "marginal" | "no-go" | "unknown"; justification: string };
  change?: Partial<LightingOptionValues>;
}

interface DemoCrossingPlan {
  crossing: string;
  details: Record<string, unknown>;
  options: DemoOption[];
}

const DEMO_PLANS: DemoCrossingPlan[] = [
  {
    crossing: "Glimmer River crossing",
    details: {
      supportHeightA: 180,
      supportHeightB: 165,
      attachmentHeightA: 166,
      attachmentHeightB: 151,
      sagKind: "midspan-sag",
      sagValue: 55,
      surfaceLevel: -12,
      highestWire: "shield",
      wireSeparation: 14,
      ruleSet: "faa",
      litPhase: "A",
    },
    options: [
      { kind: "line-powered", name: "Line-powered lit markers by helicopter" },
      {
        kind: "solar",
        name: "Solar lit markers by helicopter",
        feasibility: { status: "marginal", justification: "Short winter days and the wooded north bank shade the panels for part of the morning (invented demo assessment)." },
      },
      {
        kind: "unlit",
        name: "Unlit spheres only",
        feasibility: { status: "no-go", justification: "Low-level flights follow the river at night here, so the crossing must be lit (invented demo scenario)." },
      },
    ],
  },
  {
    crossing: "Old Mill Road",
    details: {
      supportHeightA: 85,
      supportHeightB: 85,
      attachmentHeightA: 75,
      attachmentHeightB: 75,
      sagKind: "midspan-sag",
      sagValue: 9,
      surfaceLevel: 0,
      highestWire: "shield",
      wireSeparation: 10,
      ruleSet: "faa",
      markerDiameterValue: 20,
      markerDiameterUnit: "in",
      litPhase: "B",
    },
    options: [
      {
        kind: "unlit",
        method: "bucket-truck",
        name: "Unlit spheres from a bucket truck",
        feasibility: { status: "go", justification: "A short road crossing away from airports and flight routes: marking by day is enough (invented demo scenario)." },
      },
      { kind: "line-powered", method: "bucket-truck", name: "Line-powered lit markers from a bucket truck" },
    ],
  },
  {
    crossing: "Hollowmere Canyon",
    details: {
      supportHeightA: 24,
      supportHeightB: 28,
      attachmentHeightA: 22,
      attachmentHeightB: 26,
      sagKind: "midspan-sag",
      sagValue: 9,
      surfaceLevel: -120,
      highestWire: "phase",
      wireSeparation: 0,
      ruleSet: "icao",
      markerDiameterValue: 80,
      markerDiameterUnit: "cm",
      icaoColour: "orange",
      litPhase: "A",
    },
    options: [
      { kind: "line-powered", name: "Line-powered lit markers by helicopter" },
      {
        kind: "solar",
        name: "Solar lit markers by helicopter",
        feasibility: { status: "go", justification: "Open canyon rim facing south with no shading; winter sun is ample (invented demo assessment)." },
      },
      {
        kind: "structure-supply",
        name: "Lights on both supports",
        feasibility: { status: "marginal", justification: "No low-voltage supply near the west support: a 1.2 km service extension would be needed (invented demo scenario)." },
        change: { mobilisation: 4_000 },
      },
    ],
  },
  {
    crossing: "Saltbrook airfield approach",
    details: {
      supportHeightA: 48,
      supportHeightB: 46,
      attachmentHeightA: 42,
      attachmentHeightB: 40,
      sagKind: "lowest-clearance",
      sagValue: 33,
      surfaceLevel: 0,
      highestWire: "shield",
      wireSeparation: 6,
      runwayEndDistance: 1_100,
      runwayEndCriticalArea: true,
      ruleSet: "faa",
      markerDiameterValue: 20,
      markerDiameterUnit: "in",
      litPhase: "C",
    },
    options: [
      { kind: "line-powered", method: "bucket-truck", name: "Line-powered lit markers from a bucket truck" },
      {
        kind: "solar",
        method: "bucket-truck",
        name: "Solar lit markers from a bucket truck",
        feasibility: { status: "go", justification: "Flat open airfield edge with no shading (invented demo assessment)." },
      },
      {
        kind: "unlit",
        method: "bucket-truck",
        name: "Unlit spheres only",
        feasibility: { status: "no-go", justification: "In the runway-end critical area the crossing must be lit at night (invented demo scenario)." },
      },
    ],
  },
];

/**
 * Fills the demo crossings' span and marking details and adds two or three lighting options to
 * each. Call after the demo crossings (and their studies) exist; crossings not found are skipped
 * and options already present by name are left alone, so a second call changes nothing new.
 */
export async function seedCrossingDetailsAndOptions(organisationId: number): Promise<void> {
  db();
  const consultant = await User.findOne({ where: { organisationId, role: "consultant" } });
  const actor = { id: consultant?.id ?? null, organisationId };
  for (const plan of DEMO_PLANS) {
    const crossing = await Crossing.findOne({ where: { organisationId, name: plan.crossing } });
    if (!crossing) continue;
    const updated = await updateCrossingDetails(actor, crossing.id, crossingDetailsSchema.parse(plan.details));
    const { counts } = await optionFormContext(organisationId, updated);
    for (const demo of plan.options) {
      if (await LightingOption.findOne({ where: { crossingId: crossing.id, name: demo.name } })) continue;
      // Marker options follow the layout's count; their maintenance is stated for that count.
      const values = { ...newOptionValues(demo.kind, demo.method, counts), ...demo.change, name: demo.name };
      const input = lightingOptionFormSchema.parse({
        ...values,
        units: values.units ?? undefined,
        feasibilityStatus: demo.feasibility?.status,
        feasibilityJustification: demo.feasibility?.justification,
      });
      await createOption(actor, crossing.id, input);
    }
  }
}
