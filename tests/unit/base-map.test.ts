// The offline base map (lib/map/base-map.ts) drawn from the atlases shipped in npm packages.
import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import type { Topology } from "topojson-specification";
import { baseMap, mapBounds } from "../../lib/map/base-map";

const require = createRequire(import.meta.url);
const atlas = {
  world: JSON.parse(readFileSync(require.resolve("world-atlas/countries-50m.json"), "utf8")) as Topology,
  states: JSON.parse(readFileSync(require.resolve("us-atlas/states-10m.json"), "utf8")) as Topology,
};

describe("base map", () => {
  it("puts every crossing inside the box, west to the left and north up", () => {
    const points = [
      { id: 1, lat: 38.62, lon: -92.18 },
      { id: 2, lat: 36.05, lon: -105.6 },
      { id: 3, lat: 40.1, lon: -99.5 },
    ];
    const map = baseMap(points, atlas);
    for (const p of map.points) {
      expect(p.x).toBeGreaterThan(0);
      expect(p.x).toBeLessThan(map.width);
      expect(p.y).toBeGreaterThan(0);
      expect(p.y).toBeLessThan(map.height);
    }
    const [east, west, north] = [map.points[0], map.points[1], map.points[2]];
    expect(west.x).toBeLessThan(east.x);
    expect(north.y).toBeLessThan(west.y);
    // Inland points: land covers the whole box, so its outline is the box itself; state borders are drawn.
    expect(map.land).toMatch(/^M0,0L800,0L800,480L0,480Z$|^M0,480L0,0L800,0L800,480Z$/);
    expect(map.states).toMatch(/^M/);
  });

  it("draws a coastline where the box holds sea", () => {
    const map = baseMap([{ id: 1, lat: 29.95, lon: -90.07 }, { id: 2, lat: 25.77, lon: -80.19 }], atlas);
    expect(map.land.length).toBeGreaterThan(1000);
  });

  it("widens the box around one crossing so its region shows", () => {
    const [[w, s], [e, n]] = mapBounds([{ id: 1, lat: 45, lon: 7 }]);
    expect(e - w).toBeCloseTo(3, 6);
    expect(n - s).toBeCloseTo(2, 6);
    const map = baseMap([{ id: 1, lat: 45, lon: 7 }], atlas);
    expect(map.points[0].x).toBeCloseTo(map.width / 2, 0);
    expect(map.countries.length).toBeGreaterThan(10); // borders of the Alps countries
  });
});
