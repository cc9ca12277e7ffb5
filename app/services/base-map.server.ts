// Loads the TopoJSON atlases shipped in npm packages once, and draws the base map of a set of
// crossings on the server (lib/map/base-map.ts); the page only gets SVG paths and points.
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { LRUCache } from "lru-cache";
import type { Topology } from "topojson-specification";
import { baseMap, type Atlas, type BaseMap, type MapPoint } from "../../lib/map/base-map";

const require = createRequire(import.meta.url);
let atlas: Atlas | null = null;

function loadAtlas(): Atlas {
  atlas ??= {
    world: JSON.parse(readFileSync(require.resolve("world-atlas/countries-50m.json"), "utf8")) as Topology,
    states: JSON.parse(readFileSync(require.resolve("us-atlas/states-10m.json"), "utf8")) as Topology,
  };
  return atlas;
}

// Projecting the 1:50m world costs ~0.5–1 s of CPU; a set of crossings rarely changes, so keep the drawing.
const drawn = new LRUCache<string, BaseMap>({ max: 50 });

export function crossingsMap(points: MapPoint[]): BaseMap {
  const key = JSON.stringify(points.map((p) => [p.id, p.lat, p.lon]));
  const cached = drawn.get(key);
  if (cached) return cached;
  const map = baseMap(points, loadAtlas());
  drawn.set(key, map);
  return map;
}
