/**
 * IEC 61131-3 direct addresses and the process image they index.
 * See ./address.ts for the syntax, the limits and the word/bit overlap rule.
 */
export type { Address, Area, Size } from './address';
export {
  AREA_BYTES,
  MAX_BYTE,
  MAX_BIT,
  SIZE_BYTES,
  SIZE_BITS,
  parseAddress,
  parseAddressCached,
  formatAddress,
  addressBitSpan,
  addressesOverlap,
} from './address';
export type { ProcessImage } from './process-image';
export {
  createProcessImage,
  cloneProcessImage,
  getBit,
  setBit,
  setByte,
  getWord,
  setWord,
  getDWord,
  setDWord,
  readAddress,
  writeAddress,
  toSigned,
} from './process-image';
