/**
 * The words of Cellwright's cautions, once, as plain text: the screens (components/ui/safety-caution.tsx,
 * components/changeovers/changeover-caution.tsx) and the printed changeover record
 * (lib/reports/changeover-report.ts, rendered in the job worker where React components are not
 * imported) all read them from here, so the printed words are the page's words.
 */

/**
 * The standard caution (DESIGN.md, Safety), in full wherever it appears: the deference to local
 * codes and licensed practice is the part a shortened version used to drop.
 */
export const SAFETY_CAUTION_TEXT =
  'Cellwright is a training and rehearsal tool; its interlocks are not safety functions. Real emergency-stop and guard circuits are hardwired or run through safety-rated devices designed to ISO 13849-1 / IEC 62061 and IEC 60204-1, robot cells follow ISO 10218, work on real equipment needs lockout/tagout, and local codes and licensed practice take precedence.';

/**
 * What a proof does not cover, on every changeover page and the printed record (issue #10), and
 * that the change still goes through the site's own management of change (common practice; e.g.
 * the change procedures ISO 13849-2 validation and OSHA 29 CFR 1910.119 describe). Always on top
 * of the standard caution, never instead of it.
 */
export const CHANGEOVER_CAUTION_LINES: readonly string[] = [
  'A proof covers the modelled logic only — not the wiring, the field devices or the safety-rated circuits of the real cell.',
  'Simulated interlocks are not safety functions; a signed record here is a rehearsal, not an approval to work on equipment.',
  'The change still goes through the site’s management-of-change procedure, lockout/tagout, local codes and licensed practice.',
];
