/**
 * The unit catalogue: unit names a note may write, their SI factors and dimensions, and the units
 * results are shown in. mathjs supplies the catalogue and its conversions from a private instance
 * built with only its Unit type: no parser, evaluator, import or createUnit is created in it, so a
 * note has nothing to reach. Everything here runs once at load; notes only read the frozen tables.
 */
import { create, UnitDependencies } from 'mathjs';

/** Exponents of the base dimensions, in mathjs order: mass, length, time, current, temperature, luminous intensity, amount, angle, bit. */
export type Dimension = readonly number[];

export const DIMENSIONLESS: Dimension = Object.freeze([0, 0, 0, 0, 0, 0, 0, 0, 0]);

export interface UnitDef {
  readonly name: string;
  /** SI value of one of this unit. */
  readonly factor: number;
  readonly dim: Dimension;
  readonly system: 'SI' | 'US' | 'either';
}

const mathUnits = create({ UnitDependencies });
const MathUnit = (mathUnits as unknown as { Unit: new (value: number, name: string) => { value: number; dimensions: number[]; units: { unit: { name: string } }[] } }).Unit;

/** Base unit names (as mathjs names them) a note may use, with SI prefixes where mathjs allows them. */
const ALLOWED_BASES: Record<string, 'SI' | 'US' | 'either'> = {
  m: 'SI', meter: 'SI', metre: 'SI', N: 'SI', newton: 'SI', Pa: 'SI', g: 'SI', s: 'either', min: 'either',
  in: 'US', inch: 'US', ft: 'US', foot: 'US', yd: 'US', mi: 'US', lbf: 'US', kip: 'US', psi: 'US',
  deg: 'either', rad: 'either',
};

/** Units mathjs lacks or names differently from a practising engineer; values from the definitions of the pound-force and the foot. */
const LBF = 4.4482216152605;
const FT = 0.3048;
const IN = 0.0254;
const FORCE: Dimension = Object.freeze([1, 1, -2, 0, 0, 0, 0, 0, 0]);
const STRESS: Dimension = Object.freeze([1, -1, -2, 0, 0, 0, 0, 0, 0]);
const LINE_LOAD: Dimension = Object.freeze([1, 0, -2, 0, 0, 0, 0, 0, 0]);
const EXTRA: Record<string, UnitDef> = {
  kip: { name: 'kip', factor: 1000 * LBF, dim: FORCE, system: 'US' },
  kips: { name: 'kips', factor: 1000 * LBF, dim: FORCE, system: 'US' },
  lb: { name: 'lb', factor: LBF, dim: FORCE, system: 'US' },
  lbs: { name: 'lbs', factor: LBF, dim: FORCE, system: 'US' },
  ksi: { name: 'ksi', factor: (1000 * LBF) / (IN * IN), dim: STRESS, system: 'US' },
  psi: { name: 'psi', factor: LBF / (IN * IN), dim: STRESS, system: 'US' },
  psf: { name: 'psf', factor: LBF / (FT * FT), dim: STRESS, system: 'US' },
  ksf: { name: 'ksf', factor: (1000 * LBF) / (FT * FT), dim: STRESS, system: 'US' },
  plf: { name: 'plf', factor: LBF / FT, dim: LINE_LOAD, system: 'US' },
  klf: { name: 'klf', factor: (1000 * LBF) / FT, dim: LINE_LOAD, system: 'US' },
};

const cache = new Map<string, UnitDef | null>();

/** The unit a name stands for, or undefined when the name is not a unit this tool accepts. */
export function lookupUnit(name: string): UnitDef | undefined {
  if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(name) || name.length > 12) return undefined;
  const cached = cache.get(name);
  if (cached !== undefined) return cached ?? undefined;
  let def: UnitDef | null = null;
  if (Object.prototype.hasOwnProperty.call(EXTRA, name)) {
    def = EXTRA[name]!;
  } else {
    try {
      const u = new MathUnit(1, name);
      const base = u.units[0]?.unit.name;
      const system = base !== undefined && Object.prototype.hasOwnProperty.call(ALLOWED_BASES, base) ? ALLOWED_BASES[base]! : undefined;
      if (system && u.units.length === 1 && Number.isFinite(u.value)) {
        def = { name, factor: u.value, dim: Object.freeze(u.dimensions.slice()), system };
      }
    } catch {
      def = null;
    }
  }
  cache.set(name, def);
  return def ?? undefined;
}

export function sameDimension(a: Dimension, b: Dimension): boolean {
  for (let i = 0; i < 9; i++) if ((a[i] ?? 0) !== (b[i] ?? 0)) return false;
  return true;
}

export function isDimensionless(d: Dimension): boolean {
  return sameDimension(d, DIMENSIONLESS);
}

export function mulDim(a: Dimension, b: Dimension, sign = 1): Dimension {
  const r = new Array<number>(9);
  for (let i = 0; i < 9; i++) r[i] = (a[i] ?? 0) + sign * (b[i] ?? 0);
  return r;
}

export function powDim(a: Dimension, p: number): Dimension {
  const r = new Array<number>(9);
  for (let i = 0; i < 9; i++) r[i] = (a[i] ?? 0) * p;
  return r;
}

export const DIM = {
  length: Object.freeze([0, 1, 0, 0, 0, 0, 0, 0, 0]) as Dimension,
  area: Object.freeze([0, 2, 0, 0, 0, 0, 0, 0, 0]) as Dimension,
  volume: Object.freeze([0, 3, 0, 0, 0, 0, 0, 0, 0]) as Dimension,
  quartic: Object.freeze([0, 4, 0, 0, 0, 0, 0, 0, 0]) as Dimension,
  force: FORCE,
  stress: STRESS,
  lineLoad: LINE_LOAD,
  moment: Object.freeze([1, 2, -2, 0, 0, 0, 0, 0, 0]) as Dimension,
  none: DIMENSIONLESS,
};

interface DimensionName { dim: Dimension; noun: string; si: string; us: string }
const NAMED: DimensionName[] = [
  { dim: DIM.force, noun: 'a force', si: 'kN', us: 'kip' },
  { dim: DIM.length, noun: 'a length', si: 'mm', us: 'in' },
  { dim: DIM.stress, noun: 'a stress', si: 'MPa', us: 'ksi' },
  { dim: DIM.area, noun: 'an area', si: 'mm²', us: 'in²' },
  { dim: DIM.volume, noun: 'a first moment of area', si: 'mm³', us: 'in³' },
  { dim: DIM.quartic, noun: 'a second moment of area', si: 'mm⁴', us: 'in⁴' },
  { dim: DIM.lineLoad, noun: 'a force per length', si: 'kN/m', us: 'kip/ft' },
  { dim: DIM.moment, noun: 'a moment', si: 'kN·m', us: 'kip·ft' },
  { dim: DIMENSIONLESS, noun: 'a plain number', si: '', us: '' },
];

/** "a force (kN)", "a length (mm)": how error messages name a dimension. */
export function describeDimension(d: Dimension, system: UnitSystem = 'SI'): string {
  for (const n of NAMED) {
    if (sameDimension(n.dim, d)) return n.si ? `${n.noun} (${system === 'US' ? n.us : n.si})` : n.noun;
  }
  return `a quantity in ${siUnitText(d)}`;
}

export type UnitSystem = 'SI' | 'US';

const SUPERSCRIPT: Record<string, string> = { '-': '⁻', '0': '⁰', '1': '¹', '2': '²', '3': '³', '4': '⁴', '5': '⁵', '6': '⁶', '7': '⁷', '8': '⁸', '9': '⁹' };
export function superscript(n: number): string {
  return String(n).split('').map((c) => SUPERSCRIPT[c] ?? c).join('');
}

/** The coherent SI unit of a dimension as plain ASCII, e.g. "N", "Pa", "N/m", "m^4", "kg*m^2/s". Used by the JSON contract. */
export function siUnitText(d: Dimension): string {
  const known: [Dimension, string][] = [
    [DIMENSIONLESS, ''], [DIM.force, 'N'], [DIM.stress, 'Pa'], [DIM.lineLoad, 'N/m'], [DIM.moment, 'N*m'],
    [DIM.length, 'm'], [DIM.area, 'm^2'], [DIM.volume, 'm^3'], [DIM.quartic, 'm^4'],
  ];
  for (const [k, t] of known) if (sameDimension(k, d)) return t;
  const names = ['kg', 'm', 's', 'A', 'K', 'cd', 'mol', 'rad', 'bit'];
  const num: string[] = [];
  const den: string[] = [];
  d.forEach((e, i) => {
    if (e === 0) return;
    const part = Math.abs(e) === 1 ? names[i]! : `${names[i]}^${Math.abs(e)}`;
    (e > 0 ? num : den).push(part);
  });
  const n = num.length ? num.join('*') : '1';
  return den.length ? `${n}/${den.join('/')}` : n;
}

export interface DisplayUnit { text: string; factor: number }

function du(text: string, factor: number): DisplayUnit {
  return { text, factor };
}

/**
 * The unit a computed result is shown in, by dimension, unit system and magnitude, so that a
 * nail force reads "92.6 N" and a girder shear "66.6 kN", a span "12 m" and a plate "16 mm".
 */
export function preferredUnit(d: Dimension, siValue: number, system: UnitSystem): DisplayUnit | undefined {
  const a = Math.abs(siValue);
  if (system === 'SI') {
    if (sameDimension(d, DIM.force)) return a !== 0 && a < 1000 ? du('N', 1) : du('kN', 1e3);
    if (sameDimension(d, DIM.stress)) return a !== 0 && a < 1e5 ? du('kPa', 1e3) : du('MPa', 1e6);
    if (sameDimension(d, DIM.length)) return a >= 10 ? du('m', 1) : du('mm', 1e-3);
    if (sameDimension(d, DIM.area)) return du('mm²', 1e-6);
    if (sameDimension(d, DIM.volume)) return du('mm³', 1e-9);
    if (sameDimension(d, DIM.quartic)) return du('mm⁴', 1e-12);
    if (sameDimension(d, DIM.lineLoad)) return a !== 0 && a < 1000 ? du('N/m', 1) : du('kN/m', 1e3);
    if (sameDimension(d, DIM.moment)) return a !== 0 && a < 1000 ? du('N·m', 1) : du('kN·m', 1e3);
  } else {
    const kip = 1000 * LBF;
    if (sameDimension(d, DIM.force)) return a !== 0 && a < kip ? du('lbf', LBF) : du('kip', kip);
    if (sameDimension(d, DIM.stress)) return a !== 0 && a < kip / IN / IN ? du('psi', LBF / IN / IN) : du('ksi', kip / IN / IN);
    if (sameDimension(d, DIM.length)) return a >= 100 * IN ? du('ft', FT) : du('in', IN);
    if (sameDimension(d, DIM.area)) return du('in²', IN * IN);
    if (sameDimension(d, DIM.volume)) return du('in³', IN ** 3);
    if (sameDimension(d, DIM.quartic)) return du('in⁴', IN ** 4);
    if (sameDimension(d, DIM.lineLoad)) return a !== 0 && a < kip / IN ? du('lbf/in', LBF / IN) : du('kip/in', kip / IN);
    if (sameDimension(d, DIM.moment)) return du('kip·ft', kip * FT);
  }
  if (isDimensionless(d)) return du('', 1);
  return undefined;
}

/** Counts how many unit names of each system a text uses; the note's system is the larger count (SI on a tie). */
export function unitSystemOf(unitNames: Iterable<string>): UnitSystem {
  let si = 0;
  let us = 0;
  for (const n of unitNames) {
    const def = lookupUnit(n);
    if (!def) continue;
    if (def.system === 'SI') si++;
    else if (def.system === 'US') us++;
  }
  return us > si ? 'US' : 'SI';
}
