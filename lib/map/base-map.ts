// An offline base map for a set of crossings: land, country and state borders from TopoJSON
// shipped in npm packages (world-atlas, us-atlas), projected with d3-geo to SVG path strings,
// and each crossing as an x/y point. No tiles, no request leaves the machine. Pure: the caller
// passes the topologies in.
import { geoMercator, geoPath, type GeoPermissibleObjects } from "d3-geo";
import { feature, mesh } from "topojson-client";
import type { GeometryCollection, Topology } from "topojson-specification";

export interface MapPoint {
  id: number;
  lat: number;
  lon: number;
}

export interface BaseMap {
  width: number;
  height: number;
  /** Land (fill), country borders and state borders (strokes), as SVG path data; clipped to the box. */
  land: string;
  countries: string;
  states: string;
  points: { id: number; x: number; y: number }[];
}

export interface Atlas {
  world: Topology;
  states: Topology;
}

/** The box around the points, widened so one crossing or a tight cluster still shows its region. */
export function mapBounds(points: MapPoint[]): [[number, number], [number, number]] {
  if (points.length === 0) return [[-125, 24], [-66, 50]]; // the contiguous United States
  const lons = points.map((p) => p.lon);
  const lats = points.map((p) => p.lat);
  const [w, e, s, n] = [Math.min(...lons), Math.max(...lons), Math.min(...lats), Math.max(...lats)];
  const padLon = Math.max(1.5, (e - w) * 0.15);
  const padLat = Math.max(1, (n - s) * 0.15);
  return [
    [Math.max(-180, w - padLon), Math.max(-80, s - padLat)],
    [Math.min(180, e + padLon), Math.min(84, n + padLat)],
  ];
}

export function baseMap(points: MapPoint[], atlas: Atlas, size = { width: 800, height: 480 }): BaseMap {
  const [[w, s], [e, n]] = mapBounds(points);
  const box: GeoPermissibleObjects = {
    type: "Feature",
    properties: {},
    geometry: { type: "MultiPoint", coordinates: [[w, s], [e, s], [e, n], [w, n]] },
  };
  const projection = geoMercator().fitExtent([[8, 8], [size.width - 8, size.height - 8]], box);
  projection.clipExtent([[0, 0], [size.width, size.height]]);
  const path = geoPath(projection).digits(1);
  const worldObjects = atlas.world.objects as Record<string, GeometryCollection>;
  const stateObjects = atlas.states.objects as Record<string, GeometryCollection>;
  const land = path(feature(atlas.world, worldObjects.land ?? worldObjects.countries) as GeoPermissibleObjects) ?? "";
  const countries = path(mesh(atlas.world, worldObjects.countries, (a, b) => a !== b) as GeoPermissibleObjects) ?? "";
  const states = path(mesh(atlas.states, stateObjects.states, (a, b) => a !== b) as GeoPermissibleObjects) ?? "";
  return {
    ...size,
    land,
    countries,
    states,
    points: points.map((p) => {
      const [x, y] = projection([p.lon, p.lat]) ?? [NaN, NaN];
      return { id: p.id, x: Math.round(x * 10) / 10, y: Math.round(y * 10) / 10 };
    }),
  };
}
