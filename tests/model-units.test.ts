/**
 * Unit factors against their definitions.
 *
 * Source: NIST Special Publication 811 (2008), "Guide for the Use of the International System
 * of Units (SI)", Appendix B.8. The exact definitions used: 1 in = 0.0254 m, 1 ft = 0.3048 m,
 * 1 lbf = 0.453 592 37 kg x 9.806 65 m/s^2 (avoirdupois pound times standard gravity),
 * 1 kip = 1000 lbf. The rounded table values checked below (psi = 6.894 757 E+03 Pa,
 * ksi = 6.894 757 E+06 Pa, lbf/ft^2 = 4.788 026 E+01 Pa) are recalled from that appendix, not
 * checked against the text; they also follow from the exact definitions, which the tests
 * compute independently, so the test does not rest on memory alone.
 */
import { describe, expect, it } from 'vitest';
import { FORCE_TO_N, LENGTH_TO_M, resolveUnits, stressFactor } from '../src/model/units.js';

describe('unit factors', () => {
  it('lbf is exactly 0.45359237 kg x 9.80665 m/s^2 (checked in exact integer arithmetic)', () => {
    // 0.45359237 * 9.80665 = 45359237 * 980665 / 10^13
    expect(45359237n * 980665n).toBe(44482216152605n);
    expect(FORCE_TO_N.lbf).toBe(44482216152605 / 1e13);
    expect(FORCE_TO_N.kip).toBe(FORCE_TO_N.lbf * 1000);
  });
  it('inch and foot are exact', () => {
    expect(LENGTH_TO_M.in).toBe(0.0254);
    expect(LENGTH_TO_M.ft).toBe(0.3048);
    expect(LENGTH_TO_M.ft / LENGTH_TO_M.in).toBeCloseTo(12, 14);
  });
  it('metric prefixes are exact powers of ten', () => {
    expect(LENGTH_TO_M).toMatchObject({ mm: 1e-3, cm: 1e-2, m: 1 });
    expect(FORCE_TO_N).toMatchObject({ N: 1, kN: 1e3, MN: 1e6 });
  });
});

describe('resolveUnits', () => {
  it('defaults to mm and N, stress in MPa with factor exactly 1e6', () => {
    const u = resolveUnits();
    expect(u).toMatchObject({ length: 'mm', force: 'N', stress: 'MPa', moment: 'N*mm' });
    expect(u.toSI).toEqual({ length: 1e-3, force: 1, stress: 1e6, moment: 1e-3 });
  });
  it('names the common stress units and writes out the rest', () => {
    const name = (length: 'mm' | 'cm' | 'm' | 'in' | 'ft', force: 'N' | 'kN' | 'MN' | 'lbf' | 'kip') => resolveUnits({ length, force }).stress;
    expect(name('m', 'N')).toBe('Pa');
    expect(name('m', 'kN')).toBe('kPa');
    expect(name('m', 'MN')).toBe('MPa');
    expect(name('mm', 'kN')).toBe('GPa');
    expect(name('in', 'lbf')).toBe('psi');
    expect(name('in', 'kip')).toBe('ksi');
    expect(name('ft', 'lbf')).toBe('psf');
    expect(name('ft', 'kip')).toBe('ksf');
    expect(name('cm', 'kN')).toBe('kN/cm^2');
    expect(name('mm', 'lbf')).toBe('lbf/mm^2');
  });
  it('SI stress factors are exact: Pa 1, kPa 1e3, MPa 1e6, GPa 1e9, kN/cm^2 1e7', () => {
    expect(resolveUnits({ length: 'm', force: 'N' }).toSI.stress).toBe(1);
    expect(resolveUnits({ length: 'm', force: 'kN' }).toSI.stress).toBe(1e3);
    expect(resolveUnits({ length: 'm', force: 'MN' }).toSI.stress).toBe(1e6);
    expect(resolveUnits({ length: 'mm', force: 'kN' }).toSI.stress).toBe(1e9);
    expect(resolveUnits({ length: 'cm', force: 'kN' }).toSI.stress).toBe(1e7);
  });
  it('psi, ksi and psf match NIST SP 811 B.8 to its 7 digits and the exact definitions to round-off', () => {
    const psi = resolveUnits({ length: 'in', force: 'lbf' }).toSI.stress;
    const ksi = resolveUnits({ length: 'in', force: 'kip' }).toSI.stress;
    const psf = resolveUnits({ length: 'ft', force: 'lbf' }).toSI.stress;
    expect(Number(psi.toPrecision(7))).toBe(6894.757);
    expect(Number(ksi.toPrecision(7))).toBe(6894757);
    expect(Number(psf.toPrecision(7))).toBe(47.88026);
    // Exact: 1 psi = (44482216152605e-13 N) / (64516e-8 m^2) = (44482216152605 / 64516) e-5 Pa.
    // The quotient, taken with 20 extra decimal digits in integers, is psi in units of 1e-25 Pa.
    const q = (44482216152605n * 10n ** 20n) / 64516n;
    const exactPsi = Number(q) * 1e-25;
    expect(Math.abs(psi / exactPsi - 1)).toBeLessThan(4 * Number.EPSILON);
  });
  it('moments are force times length', () => {
    const u = resolveUnits({ length: 'in', force: 'kip' });
    expect(u.moment).toBe('kip*in');
    expect(u.toSI.moment).toBeCloseTo(4448.2216152605 * 0.0254, 10);
  });
  it('stressFactor converts between unit sets', () => {
    const psi = resolveUnits({ length: 'in', force: 'lbf' });
    const mpa = resolveUnits();
    expect(stressFactor(psi, mpa) * 1e6).toBeCloseTo(6894.757293168361, 8);
    expect(stressFactor(mpa, mpa)).toBe(1);
  });
});
