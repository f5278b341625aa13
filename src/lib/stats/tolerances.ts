/**
 * Every numerical tolerance and threshold of the core, named, in one place. Each helper domain
 * keeps its own section; a literal tolerance anywhere else in src/lib/stats is a defect.
 */

// ── Linear algebra, overlap and structure ──────────────────────────────────────────────

// ── Correlation ────────────────────────────────────────────────────────────────────────

// ── Reliability, models and distributions ──────────────────────────────────────────────
