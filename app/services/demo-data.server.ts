// The invented demo scenario's circuits, crossings and load histories. Profiles go in through
// the same streamed ingest and save path as a user's upload.
import { Organisation, User } from "../../db/models";
import { DEMO_PROFILES, generateLoadCsv } from "../../lib/demo/load-generator";
import type { CircuitInput, CrossingInput } from "../../shared/circuit-schemas";
import { db } from "../utils/db.server";
import { createCircuit, createCrossing } from "./circuits.server";
import { ingestByteStream, saveProfile } from "./profiles.server";

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
  for (const demo of DEMO_CIRCUITS) {
    const circuit = await createCircuit(actor, demo.circuit);
    for (const x of demo.crossings) await createCrossing(actor, circuit.id, x);
    const profile = DEMO_PROFILES.find((p) => p.key === demo.profileKey)!;
    const csv = generateLoadCsv(profile.spec);
    const result = await ingestByteStream(textStream(csv), profile.mapping);
    await saveProfile(actor, circuit.id, result, { name: profile.title, sourceFile: `${profile.key}.csv`, mapping: profile.mapping });
  }
}
