// The default rule set of a new crossing by its location: FAA inside the United States and its
// territories, ICAO elsewhere (docs/rule-book.md). The test is offline: the states and
// territories of the us-atlas package (U.S. Census Bureau cartographic boundaries, 1:10 m),
// tested with d3-geo's spherical point-in-polygon. The user can always choose the other set.
import { geoContains } from "d3-geo";
import { feature } from "topojson-client";
import type { FeatureCollection, Geometry } from "geojson";
import type { GeometryCollection, Topology } from "topojson-specification";
import states from "us-atlas/states-10m.json";
import type { RuleSet } from "../../shared/marker-schemas";

const topology = states as unknown as Topology<{ states: GeometryCollection<{ name: string }> }>;
const shapes = feature(topology, topology.objects.states) as FeatureCollection<Geometry, { name: string }>;

export interface RuleSetChoice {
  ruleSet: RuleSet;
  /** Why, in words: the state or territory found, or that none was. */
  reason: string;
}

/** FAA where the point lies in a US state, DC or a US territory; ICAO elsewhere. */
export function defaultRuleSetAt(lat: number, lon: number): RuleSetChoice {
  const place = shapes.features.find((f) => geoContains(f, [lon, lat]));
  return place
    ? { ruleSet: "faa", reason: `The crossing lies in ${place.properties.name} (United States): FAA rules by default.` }
    : { ruleSet: "icao", reason: "The crossing lies outside the United States and its territories: ICAO rules by default." };
}
