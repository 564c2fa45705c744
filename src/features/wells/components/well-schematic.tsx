import { useId } from 'react';
import type { DisplayUnits } from '@shared/schemas/sites';
import type { Well } from '@shared/schemas/wells';
import { lengthFromSi, lengthToSi } from '@shared/units/length';
import { formatLength, lengthUnitFor } from '../units';

const W = 420;
const H = 560;
const TOP = 28;
const BOTTOM = H - 44;
const AXIS_X = 52;
const CX = 128;
const LABEL_X = 204;
/** The ground and formation stop short of the labels so that the labels sit on white. */
const FORMATION_RIGHT = LABEL_X - 12;
/** The borehole is drawn this many px either side of the axis; casing and screen to the same horizontal scale. */
const BOREHOLE_HALF_PX = 30;
/** The Lw dimension line, left of the borehole. */
const LW_X = CX - BOREHOLE_HALF_PX - 12;

type Label = { y: number; text: string; tone?: 'water' | 'muted' };

/** Spread labels so none overlaps the one above it, keeping their order. */
function spread(labels: Label[], gap = 17): (Label & { ty: number })[] {
  const sorted = [...labels].sort((a, b) => a.y - b.y);
  const out: (Label & { ty: number })[] = [];
  for (const l of sorted) {
    const prev = out[out.length - 1];
    out.push({ ...l, ty: prev ? Math.max(l.y, prev.ty + gap) : l.y });
  }
  // Pull back up anything pushed past the bottom.
  for (let i = out.length - 1; i >= 0; i--) {
    const limit = i === out.length - 1 ? BOTTOM + 10 : out[i + 1].ty - gap;
    out[i].ty = Math.min(out[i].ty, limit);
  }
  return out;
}

function niceStep(span: number): number {
  const raw = span / 8;
  const p = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 2.5, 5, 10]) if (raw <= m * p) return m * p;
  return 10 * p;
}

/**
 * The well's construction drawn to scale in depth: ground, casing and stick-up, screen, filter
 * pack in the borehole, and the static water level. Widths have their own, larger scale (stated).
 */
export function WellSchematic({ well, displayUnits }: { well: Well; displayUnits: DisplayUnits }) {
  const uid = useId().replace(/:/g, '');
  const stickupM = well.measuringPointElevationM - well.groundElevationM;
  const staticBelowGroundM = well.staticWaterDepthM === null ? null : well.staticWaterDepthM - stickupM;
  const topM = Math.min(0, -stickupM) - 0.6;
  const bottomM = well.screenBottomDepthM + Math.max(0.8, 0.08 * well.screenBottomDepthM);
  const vScale = (BOTTOM - TOP) / (bottomM - topM);
  const y = (depthM: number) => TOP + (depthM - topM) * vScale;
  const hScale = BOREHOLE_HALF_PX / well.boreholeRadiusM;
  const casingHalf = Math.max(2.5, well.casingRadiusM * hScale);
  const screenHalf = Math.max(2.5, well.screenRadiusM * hScale);
  const exaggeration = hScale / vScale;

  const depthUnit = lengthUnitFor(displayUnits, 'depth');
  const spanU = lengthFromSi(bottomM - topM, depthUnit);
  const stepU = niceStep(spanU);
  const ticks: number[] = [];
  for (let t = 0; lengthFromSi(bottomM, depthUnit) >= t; t += stepU) ticks.push(t);
  const toM = (u: number) => lengthToSi(u, depthUnit);

  const d = (m: number) => formatLength(m, displayUnits, 'depth', true);
  const e = (m: number) => formatLength(m, displayUnits, 'elevation', true);
  const yGround = y(0);
  const yMp = y(-stickupM);
  const yTop = y(well.screenTopDepthM);
  const yBot = y(well.screenBottomDepthM);
  const yStatic = staticBelowGroundM === null ? null : y(staticBelowGroundM);

  const labels = spread([
    { y: yMp, text: `Measuring point ${e(well.measuringPointElevationM)}` },
    { y: yGround, text: `Ground ${e(well.groundElevationM)}` },
    { y: yTop, text: `Screen top ${d(well.screenTopDepthM)}` },
    { y: yBot, text: `Screen bottom ${d(well.screenBottomDepthM)}` },
    ...(yStatic === null || staticBelowGroundM === null ? [] : [{ y: yStatic, text: `Static level ${d(well.staticWaterDepthM!)} below MP`, tone: 'water' as const }]),
  ]);

  const description = [
    `Ground at ${e(well.groundElevationM)}, measuring point ${stickupM >= 0 ? `${d(stickupM)} above` : `${d(-stickupM)} below`} ground.`,
    `Screen from ${d(well.screenTopDepthM)} to ${d(well.screenBottomDepthM)} below ground.`,
    well.staticWaterDepthM === null ? 'No static water level entered.' : `Static water level ${d(well.staticWaterDepthM)} below the measuring point.`,
  ].join(' ');

  const waterTop = yStatic === null ? null : Math.max(yStatic, yMp);

  return (
    <figure className="mx-auto w-full max-w-lg">
      <svg viewBox={`0 0 ${W} ${H}`} className="h-auto w-full" role="img" aria-labelledby={`${uid}-t ${uid}-d`}>
        <title id={`${uid}-t`}>{`Construction of ${well.name}`}</title>
        <desc id={`${uid}-d`}>{description}</desc>
        <defs>
          <pattern id={`${uid}-pack`} width="6" height="6" patternUnits="userSpaceOnUse">
            <rect width="6" height="6" fill="#f3e3b5" />
            <circle cx="1.5" cy="1.5" r="0.9" fill="#b08a3e" />
            <circle cx="4.5" cy="4.5" r="0.9" fill="#b08a3e" />
          </pattern>
          <pattern id={`${uid}-slots`} width="6" height="4" patternUnits="userSpaceOnUse">
            <rect width="6" height="4" fill="#ffffff" />
            <line x1="0" y1="2" x2="6" y2="2" stroke="#334155" strokeWidth="1" />
          </pattern>
          <pattern id={`${uid}-soil`} width="8" height="8" patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
            <line x1="0" y1="0" x2="0" y2="8" stroke="#a8a29e" strokeWidth="1.2" />
          </pattern>
        </defs>

        {/* Formation below the ground surface */}
        <rect x={AXIS_X + 8} y={yGround} width={FORMATION_RIGHT - AXIS_X - 8} height={BOTTOM - yGround} fill="#faf7f0" />
        <rect x={AXIS_X + 8} y={yGround} width={FORMATION_RIGHT - AXIS_X - 8} height="7" fill={`url(#${uid}-soil)`} />
        <line x1={AXIS_X + 8} x2={FORMATION_RIGHT} y1={yGround} y2={yGround} stroke="#57534e" strokeWidth="1.5" />

        {/* Depth axis (below ground) */}
        <line x1={AXIS_X} x2={AXIS_X} y1={y(0)} y2={BOTTOM} stroke="#94a3b8" />
        {ticks.map((t) => (
          <g key={t}>
            <line x1={AXIS_X - 4} x2={AXIS_X} y1={y(toM(t))} y2={y(toM(t))} stroke="#94a3b8" />
            <text x={AXIS_X - 7} y={y(toM(t)) + 4} textAnchor="end" fontSize="12" fill="#475569">
              {Number(t.toFixed(2))}
            </text>
          </g>
        ))}
        <text x={14} y={(y(0) + BOTTOM) / 2} fontSize="12" fill="#475569" transform={`rotate(-90 14 ${(y(0) + BOTTOM) / 2})`} textAnchor="middle">
          {`Depth below ground (${depthUnit})`}
        </text>

        {/* Borehole annulus above the screen, then the filter pack alongside it */}
        <rect x={CX - BOREHOLE_HALF_PX} y={yGround} width={BOREHOLE_HALF_PX * 2} height={Math.max(0, yTop - yGround)} fill="#e2e8f0" />
        <rect x={CX - BOREHOLE_HALF_PX} y={yTop} width={BOREHOLE_HALF_PX * 2} height={yBot - yTop} fill={`url(#${uid}-pack)`} />
        <rect x={CX - BOREHOLE_HALF_PX} y={yGround} width={BOREHOLE_HALF_PX * 2} height={yBot - yGround} fill="none" stroke="#78716c" strokeDasharray="3 2" />

        {/* Casing from the measuring point to the screen, then the screen */}
        <rect x={CX - casingHalf} y={yMp} width={casingHalf * 2} height={yTop - yMp} fill="#ffffff" stroke="#334155" strokeWidth="1.5" />
        <rect x={CX - screenHalf} y={yTop} width={screenHalf * 2} height={yBot - yTop} fill={`url(#${uid}-slots)`} stroke="#334155" strokeWidth="1.5" />
        <line x1={CX - screenHalf} x2={CX + screenHalf} y1={yBot} y2={yBot} stroke="#334155" strokeWidth="3" />

        {/* Water in the well and the static level */}
        {waterTop !== null && waterTop < yBot ? (
          <rect x={CX - Math.min(casingHalf, screenHalf) + 1} y={waterTop} width={Math.min(casingHalf, screenHalf) * 2 - 2} height={yBot - waterTop} fill="#60a5fa" fillOpacity="0.35" />
        ) : null}
        {yStatic !== null ? (
          <g>
            <line x1={LW_X - 4} x2={FORMATION_RIGHT} y1={yStatic} y2={yStatic} stroke="#2563eb" strokeWidth="1.5" />
            <path d={`M ${FORMATION_RIGHT - 18} ${yStatic - 9} h 12 l -6 8 z`} fill="#2563eb" />
          </g>
        ) : null}

        {/* Lw: static level to screen bottom, a dimension line beside the borehole */}
        {yStatic !== null && well.staticToScreenBottomM !== null && yStatic < yBot ? (
          <g>
            <line x1={LW_X} x2={LW_X} y1={yStatic + 3} y2={yBot - 3} stroke="#2563eb" />
            <path d={`M ${LW_X - 4} ${yStatic + 7} l 4 -6 l 4 6 z M ${LW_X - 4} ${yBot - 7} l 4 6 l 4 -6 z`} fill="#2563eb" />
            <text x={LW_X - 6} y={(yStatic + yBot) / 2} fontSize="12" fill="#1d4ed8" transform={`rotate(-90 ${LW_X - 6} ${(yStatic + yBot) / 2})`} textAnchor="middle">
              {`Lw ${d(well.staticToScreenBottomM)}`}
            </text>
          </g>
        ) : null}

        {/* Labels with leaders */}
        {labels.map((l) => (
          <g key={l.text}>
            <polyline points={`${CX + BOREHOLE_HALF_PX + 4},${l.y} ${FORMATION_RIGHT},${l.y} ${LABEL_X - 3},${l.ty}`} fill="none" stroke={l.tone === 'water' ? '#93c5fd' : '#94a3b8'} />
            <text x={LABEL_X} y={l.ty + 4} fontSize="13" fill={l.tone === 'water' ? '#1d4ed8' : '#1e293b'}>
              {l.text}
            </text>
          </g>
        ))}

        {/* Unit beside the screen */}
        {well.hydroUnit ? (
          <text x={CX} y={Math.min(yBot + 17, BOTTOM + 14)} textAnchor="middle" fontSize="12" fill="#57534e" fontStyle="italic">
            {well.hydroUnit}
          </text>
        ) : null}
      </svg>
      <figcaption className="mt-1 text-center text-xs text-slate-500">
        Depths to scale; widths drawn about {Math.round(exaggeration)}× wider (borehole radius {formatLength(well.boreholeRadiusM, displayUnits, 'radius', true)}).
        {well.staticWaterDepthM === null ? ' No static water level entered.' : ''}
      </figcaption>
    </figure>
  );
}
