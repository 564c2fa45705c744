/** Extraction-well screening: Javandel & Tsang (1986), Cooper & Jacob (1946), plane head gradient. */

export interface CaptureParams {
  rateM3PerS: number;
  thicknessM: number;
  kMetersPerSecond: number;
  gradient: number;
}

export interface CaptureZone {
  darcyVelocityMPerS: number;
  stagnationPointM: number;
  captureWidthAtWellM: number;
  captureWidthFarM: number;
}

export function captureZone(_p: CaptureParams): CaptureZone {
  throw new Error('not implemented');
}

export function captureEnvelope(_p: CaptureParams, _upgradientLengthM?: number, _samples = 200): [number, number][] {
  throw new Error('not implemented');
}

export function rotateToFlow(_points: [number, number][], _flowDirectionDeg: number): [number, number][] {
  throw new Error('not implemented');
}

export interface CooperJacobParams {
  rateM3PerS: number;
  transmissivityM2PerS: number;
  storativity: number;
  radiusM: number;
  timeS: number;
}

export function cooperJacob(_p: CooperJacobParams): { drawdownM: number; u: number; valid: boolean } {
  throw new Error('not implemented');
}

export interface HeadGradient {
  magnitude: number;
  flowDirectionDeg: number;
  fit: { a: number; b: number; c: number; rmsM: number };
}

export function headGradient(_points: { x: number; y: number; head: number }[]): HeadGradient {
  throw new Error('not implemented');
}
