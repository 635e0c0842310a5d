// Changeover shapes: stored below db/ and lib/ (db/types/changeovers.ts); re-exported for the browser and lib/.
export {
  CHANGEOVER_STATES,
  type ChangeoverAbilities,
  type ChangeoverEvent,
  type ChangeoverEventKind,
  type ChangeoverState,
  type Changeover,
  type CountersignerCandidate,
  type PersonRef,
  type RecordContent,
  type SignedRecord,
} from '@/db/types/changeovers';
