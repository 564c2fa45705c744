import proj4 from 'proj4';
import type { Feature, FeatureCollection, Geometry } from 'geojson';
import type { LocalLayer } from '@shared/geo/basemap';
import {
  along,
  between,
  blob,
  circle,
  distToLine,
  inside,
  lineLength,
  PointIndex,
  rect,
  ribbon,
  SegmentIndex,
  seeded,
  smooth,
  smoothRing,
  type Pt,
  type Ring,
} from './geometry';

/*
 * Kfield's invented demo area: the town of Hollinford, the villages of Larkmoor and Copse End,
 * the River Tamsel and the "Willow Bend former fuel depot". None of it exists. It is drawn on
 * EPSG:32632 around easting 512000, northing 5290000 — the origin of the demo site's wells
 * (server/db/seed/demo-wells.ts) — in metres east (u) and north (v) of that origin, and turned
 * into longitude/latitude at the end. The same seed gives the same area on every run.
 */
export const DEMO_ORIGIN = { easting: 512000, northing: 5290000 };
export const DEMO_EPSG = 32632;
const UTM32N = '+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs';
/** The invented area, in metres from the origin: [uMin, vMin, uMax, vMax]. */
export const DEMO_EXTENT_M = [-4200, -3300, 4200, 3300] as const;

type Props = Record<string, string | number | boolean> & { layer: LocalLayer; minzoom: number };

export function toLonLat([u, v]: Pt): [number, number] {
  const [lon, lat] = proj4(UTM32N, 'WGS84', [DEMO_ORIGIN.easting + u, DEMO_ORIGIN.northing + v]);
  return [Math.round(lon * 1e6) / 1e6, Math.round(lat * 1e6) / 1e6];
}

const close = (r: Ring) => [...r, r[0]].map(toLonLat);

/** The demo site's boundary: west of the river bank, around all 24 wells. */
export const SITE_BOUNDARY_M: Ring = [
  [-470, -385], [60, -400], [430, -372], [442, -120], [428, 90], [400, 300], [300, 392], [120, 412],
  [-120, 402], [-380, 335], [-482, 150],
];

export function buildDemoArea(): FeatureCollection {
  const rand = seeded(20251201);
  const features: Feature<Geometry, Props>[] = [];
  const polygon = (ring: Ring, props: Props) => features.push({ type: 'Feature', properties: props, geometry: { type: 'Polygon', coordinates: [close(ring)] } });
  const line = (pts: Pt[], props: Props) => features.push({ type: 'Feature', properties: props, geometry: { type: 'LineString', coordinates: pts.map(toLonLat) } });
  const point = (p: Pt, props: Props) => features.push({ type: 'Feature', properties: props, geometry: { type: 'Point', coordinates: toLonLat(p) } });

  // Water first: everything else keeps clear of it.
  const river = smooth([
    [2900, -7200], [2500, -5200], [1900, -3400], [1500, -2500], [1150, -1700], [800, -1000], [560, -450], [470, -100], [455, 120], [420, 330],
    [300, 470], [100, 545], [-150, 575], [-450, 640], [-800, 820], [-1150, 1050], [-1500, 1250], [-2100, 1380],
    [-2700, 1600], [-3300, 2050], [-3800, 2500], [-4300, 2800], [-5600, 3300], [-7200, 4300],
  ], 4);
  const riverHalfWidth = (i: number) => 14 + 3 * Math.sin(i / 9);
  polygon(ribbon(river, riverHalfWidth), { layer: 'water', class: 'river', name: 'River Tamsel', minzoom: 10 });
  line(river, { layer: 'waterway', class: 'river', name: 'River Tamsel', minzoom: 10 });
  const leat = smooth([[-2300, -1300], [-2150, -700], [-2080, -300], [-1850, 60], [-1760, 160], [-1640, 600], [-1560, 1000], [-1500, 1250]], 3);
  line(leat, { layer: 'waterway', class: 'stream', name: 'Mill Leat', minzoom: 12 });
  const brook = smooth([[4300, 1300], [3300, 1100], [2400, 1050], [1700, 900], [1200, 700], [800, 560], [380, 390]], 3);
  line(brook, { layer: 'waterway', class: 'stream', name: 'Sedge Brook', minzoom: 12 });
  const millPond = blob(-1755, 165, 42, 30, rand, 20, 0.4);
  polygon(millPond, { layer: 'water', class: 'pond', name: 'Mill Pond', minzoom: 12 });
  const mere = blob(-250, 2300, 190, 120, rand, 28, -0.3);
  polygon(mere, { layer: 'water', class: 'lake', name: 'Larkmoor Mere', minzoom: 10 });
  const waters: Pt[][] = [river, leat, brook];
  const nearWater = (p: Pt, d: number) => waters.some((w, i) => distToLine(p, w) < d + (i === 0 ? 16 : 2)) || inside(p, millPond) || inside(p, mere);

  // Roads, main ones first.
  type Road = { pts: Pt[]; cls: string; name?: string; minzoom: number };
  const roads: Road[] = [];
  const road = (pts: Pt[], cls: string, name: string | undefined, minzoom: number, iterations = 3) => {
    const r = { pts: iterations ? smooth(pts, iterations) : pts, cls, name, minzoom };
    roads.push(r);
    return r.pts;
  };
  road([[-7200, -560], [-5600, -470], [-4300, -420], [-3100, -380], [-2600, -260], [-1900, -110], [-1400, -220], [-1000, -350], [-500, -470], [0, -482], [500, -520], [1100, -750], [1700, -1100], [2200, -1350], [2900, -1550], [4300, -1800], [5800, -2150], [7200, -2300]], 'primary', 'Hollin Road', 10);
  road([[-1400, -215], [-1350, 500], [-1250, 1000], [-1050, 1500], [-750, 1900], [-550, 2500], [-400, 3400], [-150, 5200], [-300, 7200]], 'secondary', 'Larkmoor Road', 10);
  road([[2200, -1350], [2000, -300], [1600, 600], [1100, 1250], [300, 1700], [-300, 1850], [-750, 1900]], 'secondary', 'Ferry Road', 10);
  road([[-1960, -125], [-2050, -700], [-2150, -1300], [-2300, -2200], [-2450, -3400], [-2800, -5200], [-2750, -7200]], 'secondary', 'Quarry Lane', 11);
  road([[1900, 200], [2600, 800], [3200, 1000], [4300, 1150], [5400, 1500]], 'track', 'Sedge Lane', 12);
  road([[-750, 1900], [-1600, 2300], [-2600, 2700], [-4300, 3100], [-5800, 3900], [-7200, 4900]], 'secondary', 'Hollin Wood Road', 11);
  // The depot's own roads; MW-11 sits in the access road, MW-09 beside the pump island.
  road([[20, -482], [15, -395], [60, -220], [112.8, -22.3], [160, 150], [195, 248]], 'service', 'Depot Road', 13, 0);
  road([[60, -220], [-120, -232], [-330, -172], [-425, -60]], 'service', 'Tanker Lane', 14, 1);
  road([[112.8, -22.3], [-60, -15], [-150, -12], [-300, 22], [-440, 85]], 'service', 'Pump House Way', 14, 1);
  road([[148, 105], [40, 108], [-25, 112]], 'service', undefined, 14, 0);
  // Kiln Lane industrial estate, between the depot and the town.
  road([[-790, -418], [-800, -100], [-770, 230]], 'street', 'Kiln Lane', 12, 1);
  road([[-795, -90], [-600, -70], [-560, 40]], 'street', 'Foundry Way', 13, 1);
  // A footpath along the east bank, from the Hollin Road bridge to the Sedge Brook.
  const bankStart = river.findIndex((p) => p[1] > -560);
  const bankEnd = river.findIndex((p) => p[1] > 360);
  const east = river.slice(bankStart, bankEnd).map((p, k, arr): Pt => {
    const a = arr[Math.max(0, k - 1)];
    const b = arr[Math.min(arr.length - 1, k + 1)];
    const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1;
    return [p[0] + ((b[1] - a[1]) / len) * 34, p[1] - ((b[0] - a[0]) / len) * 34];
  });
  road(east, 'path', 'Tamsel Walk', 14, 0);

  // Rail: the line south of the town and a disused siding into the depot.
  const rail = smooth([[-7200, -1350], [-4300, -1060], [-2500, -900], [-1800, -830], [-800, -800], [300, -950], [900, -1250], [1800, -1750], [2800, -2100], [4300, -2400], [7200, -2900]], 3);
  line(rail, { layer: 'road', class: 'rail', name: 'Hollinford branch line', minzoom: 11 });
  line(smooth([[-640, -803], [-330, -700], [-180, -560], [-125, -392]], 3), { layer: 'road', class: 'rail', service: 'siding', disused: true, minzoom: 13 });

  const roadIndex = new SegmentIndex(60);
  roads.forEach((r, i) => roadIndex.add(r.pts, i));
  roadIndex.add(rail, -2);
  const mainRoads = roads.filter((r) => r.cls === 'primary' || r.cls === 'secondary');

  // Settlements: a street grid clipped to an irregular outline, then houses along the streets.
  const buildings = new PointIndex(30);
  const noBuild: Ring[] = [SITE_BOUNDARY_M];
  type Town = { name: string; cls: 'town' | 'village' | 'hamlet'; c: Pt; rx: number; ry: number; rot: number; grid?: { du: number; dv: number }; streets: string[]; centre?: Ring };
  const towns: Town[] = [
    {
      name: 'Hollinford', cls: 'town', c: [-1950, -120], rx: 760, ry: 560, rot: 0.2, grid: { du: 135, dv: 105 },
      streets: ['Tanner Street', 'Chapel Row', 'Mill Street', 'Granary Lane', 'Weaver Street', 'Cooper Street', 'Saddler Row', 'Orchard Street', 'Alder Road', 'Birch Avenue', 'Rowan Street', 'Hazel Grove', 'Elm Walk', 'Linden Road', 'Willow Street', 'Ash Lane', 'Hawthorn Way', 'Maple Street', 'Bell Street', 'Lantern Row', 'Ropewalk', 'Cobble Lane', 'Brewers Row', 'Tithe Street'],
      centre: rect([-1905, -105], 230, 130, 0.2),
    },
    { name: 'Larkmoor', cls: 'village', c: [-800, 1960], rx: 330, ry: 250, rot: -0.4, streets: ['Larkmoor Green', 'Meadow Close', 'Furlong Lane', 'Pinfold Lane', 'Glebe Close'] },
    { name: 'Copse End', cls: 'village', c: [2230, -1370], rx: 300, ry: 230, rot: 0.35, streets: ['Copse Lane', 'Spinney Close', 'Coppice Way', 'Keepers Lane', 'Bracken Rise'] },
    { name: 'Sedgecote', cls: 'hamlet', c: [3150, 1010], rx: 140, ry: 90, rot: 0.15, streets: ['Sedgecote Row'] },
  ];
  const townRings = towns.map((t) => smoothRing(blob(t.c[0], t.c[1], t.rx, t.ry, rand, 24, t.rot), 1));
  const parks: Ring[] = [blob(-1745, 175, 120, 95, rand, 22, 0.3)];

  towns.forEach((t, ti) => {
    const outline = townRings[ti];
    polygon(outline, { layer: 'landuse', class: 'residential', minzoom: 10 });
    point(t.c, { layer: 'place', class: t.cls, name: t.name, minzoom: t.cls === 'town' ? 10 : t.cls === 'village' ? 11 : 13 });
    const names = [...t.streets];
    const streets: Pt[][] = [];
    if (t.grid) {
      const cos = Math.cos(t.rot);
      const sin = Math.sin(t.rot);
      const toWorld = (a: number, b: number): Pt => [t.c[0] + a * cos - b * sin, t.c[1] + a * sin + b * cos];
      const lines: Pt[][] = [];
      for (let b = -t.ry * 1.3; b <= t.ry * 1.3; b += t.grid.dv) {
        const jitter = between(rand, -8, 8);
        lines.push(...sampleInside((s) => toWorld(s, b + jitter), t.rx * 1.4, outline));
      }
      for (let a = -t.rx * 1.3; a <= t.rx * 1.3; a += t.grid.du) {
        const jitter = between(rand, -8, 8);
        lines.push(...sampleInside((s) => toWorld(a + jitter, s), t.ry * 1.4, outline));
      }
      for (const l of lines) {
        if (l.length < 2 || lineLength(l) < 90) continue;
        // Leave out grid lines that would run alongside a main road.
        const mid = along(l, lineLength(l) / 2).p;
        if (mainRoads.some((r) => distToLine(mid, r.pts) < 45 && distToLine(l[0], r.pts) < 45)) continue;
        streets.push(l);
      }
    } else {
      // A village: a few lanes off the through road, each bending a little.
      const spokes = t.cls === 'hamlet' ? 1 : 5;
      for (let k = 0; k < spokes; k++) {
        const a = t.rot + (2 * Math.PI * k) / spokes + between(rand, -0.3, 0.3);
        const len = (t.cls === 'hamlet' ? t.rx * 1.6 : between(rand, 0.55, 0.95) * Math.max(t.rx, t.ry));
        const start: Pt = t.cls === 'hamlet' ? [t.c[0] - Math.cos(a) * len / 2, t.c[1] - Math.sin(a) * len / 2] : [t.c[0] + Math.cos(a) * 30, t.c[1] + Math.sin(a) * 30];
        const bend = between(rand, -0.35, 0.35);
        const pts: Pt[] = [start];
        for (let s = 1; s <= 4; s++) {
          const ang = a + (bend * s) / 4;
          const prev = pts[pts.length - 1];
          pts.push([prev[0] + (Math.cos(ang) * len) / 4, prev[1] + (Math.sin(ang) * len) / 4]);
        }
        streets.push(smooth(pts, 2));
      }
    }
    for (const s of streets) {
      const name = names.length > 0 ? names.shift() : undefined;
      const id = roads.length;
      roads.push({ pts: s, cls: 'street', name, minzoom: 12 });
      roadIndex.add(s, id);
    }
  });

  // Houses along every street (and along the main roads inside a settlement).
  const houseRoads = roads.map((r, id) => ({ r, id })).filter(({ r }) => r.cls === 'street' || r.cls === 'primary' || r.cls === 'secondary');
  for (const { r, id } of houseRoads) {
    const len = lineLength(r.pts);
    for (let s = 12; s < len - 12; s += between(rand, 16, 22)) {
      const { p, dir } = along(r.pts, s);
      const ti = townRings.findIndex((ring) => inside(p, ring));
      const inEstate = r.name === 'Kiln Lane' || r.name === 'Foundry Way';
      if (ti < 0 && !inEstate) continue;
      for (const side of [1, -1]) {
        if (rand() < 0.12) continue;
        const centre = townsCentre(towns[ti]?.centre, p);
        const big = inEstate || centre;
        const depth = big ? between(rand, 14, 24) : between(rand, 7, 10);
        const width = big ? between(rand, 18, 34) : between(rand, 8, 13);
        const setback = (r.cls === 'street' ? 5 : 9) + (big ? 3 : between(rand, 2, 6)) + depth / 2;
        const c: Pt = [p[0] - dir[1] * side * setback, p[1] + dir[0] * side * setback];
        if (ti >= 0 && !inside(c, townRings[ti])) continue;
        if (roadIndex.nearest(c, 60, id) < depth / 2 + width / 2 + 4) continue;
        if (buildings.anyWithin(c, big ? 26 : 12.5)) continue;
        if (nearWater(c, 12 + depth / 2) || parks.some((k) => inside(c, k)) || noBuild.some((k) => inside(c, k))) continue;
        buildings.add(c);
        polygon(rect(c, width, depth, Math.atan2(dir[1], dir[0])), { layer: 'building', class: inEstate ? 'industrial' : big ? 'commercial' : 'house', minzoom: big ? 13 : 14 });
      }
    }
  }

  // The depot (all invented). Buildings kept clear of the wells.
  polygon(SITE_BOUNDARY_M, { layer: 'site', class: 'site', name: 'Willow Bend former fuel depot', minzoom: 10 });
  polygon(SITE_BOUNDARY_M, { layer: 'landuse', class: 'industrial', minzoom: 10 });
  polygon(rect([12, -300], 96, 52, 0.05), { layer: 'landuse', class: 'parking', name: 'Former tanker yard', minzoom: 13 });
  polygon(rect([-60, 110], 62, 36, 0.02), { layer: 'landuse', class: 'parking', minzoom: 14 });
  polygon([[140, 240], [362, 262], [330, 372], [150, 392]], { layer: 'landuse', class: 'grass', minzoom: 12 });
  const depotBuildings: [Pt, number, number, number, string][] = [
    [[-240, 250], 30, 14, 0, 'commercial'],
    [[-340, -345], 26, 16, 0.04, 'industrial'],
    [[250, -120], 48, 22, 0.1, 'industrial'],
    [[-60, -185], 36, 12, 0, 'industrial'],
    [[-176, -76], 8, 6, 0.2, 'industrial'],
    [[40, -385], 6, 5, 0, 'industrial'],
  ];
  for (const [c, w, d, a, cls] of depotBuildings) polygon(rect(c, w, d, a), { layer: 'building', class: cls, minzoom: 13 });
  polygon(circle([300, 195], 11, 24), { layer: 'building', class: 'tank', minzoom: 13 });
  // The bases of the demolished tanks on the former tank field, clear of MW-18 and MW-19.
  for (const c of [[190, 300], [236, 302], [282, 310], [205, 348], [250, 352], [296, 358]] as Pt[]) {
    polygon(circle(c, 13, 24), { layer: 'landuse', class: 'hardstanding', minzoom: 14 });
  }
  point([12, -272], { layer: 'area_label', class: 'industrial', name: 'Former tanker yard', minzoom: 16 });
  point([250, 378], { layer: 'area_label', class: 'industrial', name: 'Former tank field', minzoom: 16 });
  polygon([[-1010, -330], [-560, -372], [-520, 80], [-600, 270], [-990, 250]], { layer: 'landuse', class: 'industrial', name: 'Kiln Lane Estate', minzoom: 10 });
  point([-780, -160], { layer: 'area_label', class: 'industrial', name: 'Kiln Lane Estate', minzoom: 14 });
  noBuild.push([[-1010, -330], [-560, -372], [-520, 80], [-600, 270], [-990, 250]]);

  // Green land use and woods.
  for (const k of parks) polygon(k, { layer: 'landuse', class: 'grass', name: 'Mill Green', minzoom: 12 });
  point([-1700, 235], { layer: 'area_label', class: 'grass', name: 'Mill Green', minzoom: 15 });
  polygon(rect(towns[0].c, 130, 80, 0.2).map(([x, y]): Pt => [x + 60, y + 30]), { layer: 'landuse', class: 'commercial', minzoom: 13 });
  const meadowBend: Ring = [[-430, 440], [-100, 432], [250, 422], [330, 440], [120, 540], [-150, 570], [-440, 630]];
  polygon(meadowBend, { layer: 'landuse', class: 'grass', name: 'Willow Bend Meadow', minzoom: 12 });
  point([-150, 480], { layer: 'area_label', class: 'grass', name: 'Willow Bend Meadow', minzoom: 15 });
  const meadows = blob(1150, -1850, 380, 170, rand, 26, 1.2);
  polygon(meadows, { layer: 'landuse', class: 'grass', name: 'Tamsel Meadows', minzoom: 11 });
  point([1150, -1850], { layer: 'area_label', class: 'grass', name: 'Tamsel Meadows', minzoom: 13 });
  polygon(rect([-950, 2080], 110, 70, -0.4), { layer: 'landuse', class: 'grass', name: 'Larkmoor playing field', minzoom: 13 });
  const woods: { c: Pt; rx: number; ry: number; rot: number; name?: string }[] = [
    { c: [-3200, 650], rx: 650, ry: 420, rot: 0.3, name: 'Hollin Wood' },
    { c: [250, 2450], rx: 420, ry: 300, rot: -0.2, name: 'Larkmoor Copse' },
    { c: [2950, -650], rx: 460, ry: 300, rot: 0.5, name: 'Keepers Wood' },
    { c: [-120, 780], rx: 300, ry: 115, rot: 0.15, name: 'Tamsel Carr' },
    { c: [1850, 1850], rx: 260, ry: 180, rot: 0.8 },
    { c: [-2650, -2250], rx: 360, ry: 250, rot: -0.3 },
    { c: [3500, 2350], rx: 320, ry: 250, rot: 0.2 },
    { c: [-3650, -1750], rx: 300, ry: 210, rot: 1.1 },
    { c: [950, -2650], rx: 290, ry: 200, rot: 0.4 },
    { c: [-3350, 2750], rx: 380, ry: 220, rot: -0.5 },
  ];
  const woodRings = woods.map((w) => blob(w.c[0], w.c[1], w.rx, w.ry, rand, 32, w.rot));
  woods.forEach((w, i) => {
    polygon(woodRings[i], { layer: 'landuse', class: 'wood', ...(w.name ? { name: w.name } : {}), minzoom: 10 });
    if (w.name) point(w.c, { layer: 'area_label', class: 'wood', name: w.name, minzoom: 13 });
  });
  point([-1800, -860], { layer: 'area_label', class: 'station', name: 'Hollinford station', minzoom: 14 });
  polygon(rect([-1800, -852], 70, 9, 0.09), { layer: 'building', class: 'commercial', minzoom: 14 });

  // Fields: a jittered grid of hedged plots wherever nothing else is.
  const [u0, v0, u1, v1] = DEMO_EXTENT_M;
  const cell = 380;
  const taken = (p: Pt) =>
    townRings.some((r) => inside(p, r)) || woodRings.some((r) => inside(p, r)) || noBuild.some((r) => inside(p, r)) ||
    inside(p, meadows) || inside(p, meadowBend) || inside(p, mere) || distToLine(p, river) < 45;
  for (let u = u0; u < u1; u += cell) {
    for (let v = v0; v < v1; v += cell) {
      const j = () => between(rand, -55, 55);
      const corners: Ring = [[u + 10 + j(), v + 10 + j()], [u + cell - 10 + j(), v + 10 + j()], [u + cell - 10 + j(), v + cell - 10 + j()], [u + 10 + j(), v + cell - 10 + j()]];
      const centre: Pt = [u + cell / 2, v + cell / 2];
      // Fields thin out towards the edge of the invented area, so it has no hard outline.
      const edge = Math.hypot(centre[0] / u1, centre[1] / v1) + between(rand, -0.15, 0.15);
      if (rand() < 0.15 || edge > 1.1 || (edge > 0.8 && rand() < (edge - 0.8) / 0.3) || taken(centre) || corners.some(taken)) continue;
      polygon(corners, { layer: 'landuse', class: 'farmland', minzoom: 11 });
    }
  }

  for (const r of roads) line(r.pts, { layer: 'road', class: r.cls, ...(r.name ? { name: r.name } : {}), minzoom: r.minzoom });
  point([160, 640], { layer: 'place', class: 'locality', name: 'Willow Bend', minzoom: 13 });

  // Draw order inside a layer follows the array: big areas first.
  const order: Record<string, number> = { farmland: 0, residential: 1, industrial: 2, commercial: 3, grass: 4, wood: 5, parking: 6, hardstanding: 7 };
  features.sort((a, b) => (a.properties.layer === 'landuse' && b.properties.layer === 'landuse' ? order[String(a.properties.class)] - order[String(b.properties.class)] : 0));
  return { type: 'FeatureCollection', features };

  function townsCentre(centre: Ring | undefined, p: Pt) {
    return centre ? inside(p, centre) : false;
  }
}

/** The parts of a straight line (parameter s from -half to half) that fall inside a ring. */
function sampleInside(at: (s: number) => Pt, half: number, ring: Ring): Pt[][] {
  const runs: Pt[][] = [];
  let run: Pt[] = [];
  for (let s = -half; s <= half; s += 10) {
    const p = at(s);
    if (inside(p, ring)) run.push(p);
    else if (run.length) {
      runs.push(run);
      run = [];
    }
  }
  if (run.length) runs.push(run);
  // Keep only the ends of each run (the line is straight) and a middle point.
  return runs.filter((r) => r.length >= 2).map((r) => [r[0], r[Math.floor(r.length / 2)], r[r.length - 1]]);
}
