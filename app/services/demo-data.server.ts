// The invented demo scenario's circuits, crossings and load histories. Profiles go in through
// the same streamed ingest and save path as a user's upload.
import { Organisation, User } from "../../db/models";
import { DEMO_PROFILES, generateLoadCsv } from "../../lib/demo/load-generator";
import type { CircuitInput, CrossingInput } from "../../shared/circuit-schemas";
import { db } from "../utils/db.server";
import { circuitTimeZone, createCircuit, createCrossing } from "./circuits.server";
import { ingestByteStream, saveProfile } from "./profiles.server";
import { createDeviceProfile } from "./devices.server";
import { runCrossingStudy } from "./studies.server";
import { seedCrossingDetailsAndOptions } from "./crossing-demo.server";
import type { DeviceProfileInput } from "../../shared/device-forms";

interface DemoCircuit {
  circuit: CircuitInput;
  profileKey: string;
  crossings: CrossingInput[];
}

export const DEMO_CIRCUITS: DemoCircuit[] = [
  {
    circuit: { name: "Glimmerford Tie", voltageKv: 138, phases: 3, normalRatingA: 800, notes: "Interconnection tie across the Glimmer River (invented demo circuit)." },
    profileKey: "glimmerford-138",
    crossings: [
      { name: "Glimmer River crossing", lat: 38.62, lon: -92.18, spanLength: { value: 1450, unit: "ft" }, kind: "river" },
      { name: "Old Mill Road", lat: 38.6, lon: -92.21, spanLength: { value: 380, unit: "ft" }, kind: "road" },
    ],
  },
  {
    circuit: { name: "Hollowmere Feeder", voltageKv: 69, phases: 3, normalRatingA: 400, notes: "Radial feeder; light night load in spring (invented demo circuit)." },
    profileKey: "hollowmere-69",
    crossings: [{ name: "Hollowmere Canyon", lat: 36.05, lon: -105.6, spanLength: { value: 250, unit: "m" }, kind: "canyon" }],
  },
  {
    circuit: { name: "Saltbrook Line", voltageKv: 115, phases: 3, normalRatingA: 600, notes: "New line; history starts in September (invented demo circuit)." },
    profileKey: "saltbrook-115",
    crossings: [{ name: "Saltbrook airfield approach", lat: 40.1, lon: -99.5, spanLength: { value: 300, unit: "ft" }, kind: "airport-vicinity" }],
  },
];

/** Invented, generic device models (no brands). */
export const DEMO_DEVICES: DeviceProfileInput[] = [
  {
    name: "Lit sphere LS-40 (no storage)",
    note: "Invented demo model: steady red lamp in a 36 in sphere, runs from 40 A, no battery.",
    minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 0,
    chargeEfficiency: 0.9, selfDischargePctPerDay: 0, initialCharge: 1, lifeYears: 20,
  },
  {
    name: "Lit sphere LS-15B (60 Wh storage)",
    note: "Invented demo model: low-threshold harvester with a 60 Wh usable battery.",
    minCurrentA: 15, maxCurrentA: 1500, harvestW: "min(0.02 * I^2, 12)", loadW: 3, standbyW: 0.1, storageWh: 60,
    chargeEfficiency: 0.85, selfDischargePctPerDay: 0.5, initialCharge: 1, lifeYears: 15,
  },
  {
    name: "Flashing beacon FB-60 (high draw)",
    note: "Invented demo model: medium-intensity flashing unit; needs a well-loaded line.",
    minCurrentA: 60, maxCurrentA: 2500, harvestW: "min(0.003 * I^2, 30)", loadW: 12, standbyW: 0.3, storageWh: 20,
    chargeEfficiency: 0.85, selfDischargePctPerDay: 1, initialCharge: 1, lifeYears: 15,
  },
];

function textStream(text: string): ReadableStream<Uint8Array> {
  const bytes = new TextEncoder().encode(text);
  let offset = 0;
  return new ReadableStream({
    pull(controller) {
      if (offset >= bytes.length) return controller.close();
      controller.enqueue(bytes.subarray(offset, offset + 256 * 1024));
      offset += 256 * 1024;
    },
  });
}

/** Seeds circuits, crossings and profiles for the demo organisation. */
export async function seedDemoData(organisation: Organisation): Promise<void> {
  db();
  const engineer = await User.findOne({ where: { organisationId: organisation.id, role: "engineer" } });
  const actor = { id: engineer?.id ?? null, organisationId: organisation.id };
  const devices = [];
  for (const d of DEMO_DEVICES) devices.push(await createDeviceProfile(actor, d));
  for (const demo of DEMO_CIRCUITS) {
    const circuit = await createCircuit(actor, demo.circuit);
    const crossings = [];
    for (const x of demo.crossings) crossings.push(await createCrossing(actor, circuit.id, x));
    const profile = DEMO_PROFILES.find((p) => p.key === demo.profileKey)!;
    const csv = generateLoadCsv(profile.spec);
    const result = await ingestByteStream(textStream(csv), profile.mapping, undefined, undefined, await circuitTimeZone(circuit));
    const saved = await saveProfile(actor, circuit.id, result, { name: profile.title, sourceFile: `${profile.key}.csv`, mapping: profile.mapping });
    // One study of the first crossing with the plain 40 A sphere, and for the weak circuit a
    // second with the storage model, so the demo shows each verdict.
    const first = crossings[0];
    const run = (deviceProfileId: number) =>
      runCrossingStudy(actor, {
        crossingId: first.id,
        profileId: saved.id,
        deviceProfileId,
        schedule: { kind: "night", sunAltitudeDeg: -0.833 },
        params: { phase: "min", interpolation: "linear", loadScale: 1 },
        policy: {},
      });
    await run(devices[0].id);
    if (demo.profileKey === "hollowmere-69") await run(devices[1].id);
  }
  // Span details and lighting options last: line-powered options read the studies' verdicts.
  await seedCrossingDetailsAndOptions(organisation.id);
}
