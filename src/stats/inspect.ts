/**
 * The summary `tilth inspect` prints: field area, UTM zone, sample count and density, and per analyte
 * n / min / median / max / mean / CV with censored counts. Pure; the CLI prints it.
 */
import { ANALYTE_SAMPLED, ANALYTE_TERMS } from '../vocabulary.js';
import type { Warning } from '../errors.js';
import { ANALYTES, type Analyte, type FieldInputs } from '../types.js';
import { m2ToAc, m2ToHa } from '../units/index.js';
import { describe, type Description } from './describe.js';
import { HIGH_PH, SALINE_EC_DSM, SLIGHTLY_SALINE_EC_DSM, soilFlagsById } from '../agronomy/soilFlags.js';

/** The inspect table's analyte names and units (src/vocabulary.ts; organic matter and pH without a depth). */
const ANALYTE_LABELS: Record<Analyte, { name: string; unit: string }> = Object.fromEntries(
  ANALYTES.map((a) => [a, { name: ANALYTE_SAMPLED[a], unit: ANALYTE_TERMS[a].unit }]),
) as Record<Analyte, { name: string; unit: string }>;

export interface Inspection {
  field: {
    name: string;
    areaAc: number;
    areaHa: number;
    parts: number;
    holes: number;
    utmZone: string;
    epsg: number;
  };
  samples: {
    count: number;
    kind: 'grid' | 'zone composites';
    acresPerSample: number;
    pMethod: string;
    zones: string[] | null;
  };
  analytes: Record<
    Analyte,
    Description & { unit: string; label: string; censoredBelow: number; censoredAbove: number }
  >;
  /** soil values read but not used for rates, when the file has them: EC (dS/m) and carbonate (%) */
  extra: Partial<Record<'ec' | 'carbonate', Description & { unit: string; label: string }>>;
  /** flagged samples (saline, slightly saline, high pH, free lime) and the thresholds used */
  soilFlags: {
    bySample: Record<string, string>;
    salineEcDsm: number;
    slightlySalineEcDsm: number;
    highPh: number;
  };
  warnings: Warning[];
}

/**
 * Summarises loaded inputs.
 * @example inspectInputs(loadInputs({ samples, boundary })).field.areaAc
 */
export function inspectInputs(inp: FieldInputs): Inspection {
  const f = inp.field;
  const n = inp.samples.ids.length;
  const areaAc = m2ToAc(f.areaM2);
  const analytes = {} as Inspection['analytes'];
  for (const a of ANALYTES) {
    const c = inp.samples.censored[a];
    let lo = 0,
      hi = 0;
    for (let i = 0; i < c.length; i++) {
      if (c[i] < 0) lo++;
      else if (c[i] > 0) hi++;
    }
    const label = ANALYTE_LABELS[a];
    analytes[a] = {
      ...describe(inp.samples.values[a]),
      unit: label.unit,
      label:
        a === 'p'
          ? `P (${inp.samples.pMethod === 'olsen' ? 'Olsen' : 'modified Kelowna'}) 0-6 in`
          : label.name,
      censoredBelow: lo,
      censoredAbove: hi,
    };
  }
  return {
    field: {
      name: f.name,
      areaAc,
      areaHa: m2ToHa(f.areaM2),
      parts: f.parts.length,
      holes: f.parts.reduce((s, p) => s + p.holes.length, 0),
      utmZone: `${f.utm.zone}${f.utm.south ? 'S' : 'N'}`,
      epsg: f.utm.epsg,
    },
    samples: {
      count: n,
      kind: inp.zones ? 'zone composites' : 'grid',
      acresPerSample: areaAc / n,
      pMethod: inp.samples.pMethod,
      zones: inp.zones?.keys ?? null,
    },
    analytes,
    extra: Object.fromEntries(
      Object.entries(inp.samples.extra ?? {}).map(([k, v]) => [
        k,
        {
          ...describe(v),
          unit: k === 'ec' ? 'dS/m' : '%',
          label:
            k === 'ec'
              ? `EC salts${inp.samples.ecMethod ? ` ${inp.samples.ecMethod}` : ''}`
              : 'carbonate (CaCO3 eq.)',
        },
      ]),
    ),
    soilFlags: {
      bySample: soilFlagsById(inp.samples),
      salineEcDsm: SALINE_EC_DSM,
      slightlySalineEcDsm: SLIGHTLY_SALINE_EC_DSM,
      highPh: HIGH_PH,
    },
    warnings: inp.warnings,
  };
}

const fmt = (v: number, d: number) => (Number.isFinite(v) ? v.toFixed(d) : '-');

/**
 * Plain-text table of an Inspection, as `tilth inspect` prints it.
 * @example console.log(formatInspection(inspectInputs(inputs)))
 */
export function formatInspection(r: Inspection): string {
  const f = r.field,
    s = r.samples;
  const lines = [
    `field      ${f.name}: ${fmt(f.areaAc, 1)} ac (${fmt(f.areaHa, 2)} ha), ${f.parts} part(s), ${f.holes} hole(s)`,
    `projection UTM zone ${f.utmZone} (EPSG:${f.epsg}), WGS 84`,
    `samples    ${s.count} ${s.kind}, ${fmt(s.acresPerSample, 2)} ac per sample${s.zones ? `; zones ${s.zones.join(', ')}` : ''}`,
    '',
    [
      'analyte'.padEnd(26),
      'unit'.padEnd(6),
      'n'.padStart(3),
      'min'.padStart(7),
      'median'.padStart(7),
      'max'.padStart(7),
      'mean'.padStart(7),
      'CV %'.padStart(6),
      '  censored',
    ].join(' '),
  ];
  for (const a of ANALYTES) {
    const d = r.analytes[a];
    const dec = a === 'om' || a === 'ph' ? 1 : 0;
    const cens = [
      d.censoredBelow ? `${d.censoredBelow} below` : '',
      d.censoredAbove ? `${d.censoredAbove} above` : '',
    ]
      .filter(Boolean)
      .join(', ');
    lines.push(
      [
        d.label.padEnd(26),
        d.unit.padEnd(6),
        String(d.n).padStart(3),
        fmt(d.min, dec).padStart(7),
        fmt(d.median, dec).padStart(7),
        fmt(d.max, dec).padStart(7),
        fmt(d.mean, dec + 1).padStart(7),
        fmt(d.cv * 100, 0).padStart(6),
        `  ${cens || '-'}`,
      ].join(' '),
    );
  }
  for (const d of Object.values(r.extra)) {
    lines.push(
      [
        d.label.slice(0, 26).padEnd(26),
        d.unit.padEnd(6),
        String(d.n).padStart(3),
        fmt(d.min, 1).padStart(7),
        fmt(d.median, 1).padStart(7),
        fmt(d.max, 1).padStart(7),
        fmt(d.mean, 2).padStart(7),
        fmt(d.cv * 100, 0).padStart(6),
        '  -',
      ].join(' '),
    );
  }
  const flagged = Object.entries(r.soilFlags.bySample);
  if (flagged.length) {
    lines.push(
      '',
      `soil flags (no rate change): saline EC >= ${r.soilFlags.salineEcDsm} dS/m, slightly saline ${r.soilFlags.slightlySalineEcDsm}-${r.soilFlags.salineEcDsm}, high pH >= ${r.soilFlags.highPh}`,
    );
    for (const [id, f] of flagged) lines.push(`  ${id.padEnd(14)} ${f}`);
  }
  if (ANALYTES.some((a) => r.analytes[a].censoredBelow + r.analytes[a].censoredAbove > 0)) {
    lines.push(
      '',
      'censored values: below detection counted as half the limit, above range as the limit (docs/method.md)',
    );
  }
  lines.push('', r.warnings.length ? `${r.warnings.length} warning(s) follow on stderr` : 'no warnings');
  return lines.join('\n');
}
