/**
 * The cautions a printed record carries, as plain text for the PDF renderer, which runs in the
 * job worker under the react-server condition, where the React components that show them on
 * screen (components/ui/safety-caution.tsx, components/changeovers/changeover-caution.tsx)
 * cannot be imported. lib/reports/cautions.test.ts fails when these and the screen's differ,
 * so the printed words never drift from the page's.
 */

/** The standard caution (DESIGN.md, Safety), word for word as on screen. */
export const PRINTED_SAFETY_CAUTION =
  'Cellwright is a training and rehearsal tool; its interlocks are not safety functions. Real emergency-stop and guard circuits are hardwired or run through safety-rated devices designed to ISO 13849-1 / IEC 62061 and IEC 60204-1, robot cells follow ISO 10218, work on real equipment needs lockout/tagout, and local codes and licensed practice take precedence.';

/** What a proof does not cover, as on every changeover page. */
export const PRINTED_CHANGEOVER_CAUTION: readonly string[] = [
  'A proof covers the modelled logic only — not the wiring, the field devices or the safety-rated circuits of the real cell.',
  'Simulated interlocks are not safety functions; a signed record here is a rehearsal, not an approval to work on equipment.',
  'The change still goes through the site’s management-of-change procedure, lockout/tagout, local codes and licensed practice.',
];
