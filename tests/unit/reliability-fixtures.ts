/**
 * Helpers for the tests of the reliability, model and distribution part of the core (not a
 * module under test): reading the committed reference fixtures written by
 * scripts/reference/reliability.R, and comparing numbers.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const fixtureDirectory = fileURLToPath(new URL('../../fixtures/reference/', import.meta.url));

/** Parsed JSON of fixtures/reference/<name>. */
export function readReferenceFixture<T>(name: string): T {
  return JSON.parse(readFileSync(fixtureDirectory + name, 'utf8')) as T;
}

/** |actual − expected| / |expected|, or |actual| when expected is 0. */
export function relativeError(actual: number, expected: number): number {
  if (expected === 0) return Math.abs(actual);
  return Math.abs(actual - expected) / Math.abs(expected);
}

/** Log relative error as NIST StRD defines it: −log10(|c − t| / |t|); 17 for an exact match. */
export function logRelativeError(computed: number, certified: number): number {
  if (computed === certified) return 17;
  return -Math.log10(Math.abs(computed - certified) / Math.abs(certified));
}

/** Every value of a nested structure that is a number, for NaN/Infinity scans of results. */
export function collectNumbers(value: unknown, out: number[] = []): number[] {
  if (typeof value === 'number') out.push(value);
  else if (ArrayBuffer.isView(value)) out.push(...Array.from(value as unknown as ArrayLike<number>));
  else if (Array.isArray(value)) value.forEach((item) => collectNumbers(item, out));
  else if (value !== null && typeof value === 'object') Object.values(value).forEach((item) => collectNumbers(item, out));
  return out;
}
