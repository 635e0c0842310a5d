import { describe, expect, it } from 'vitest';
import { sniffImageType } from './sniff';

const bytes = (hex: string) => Uint8Array.from(Buffer.from(hex.replace(/\s/g, ''), 'hex'));
const ascii = (s: string) => Uint8Array.from(Buffer.from(s, 'latin1'));

describe('sniffImageType', () => {
  it('recognises each signature', () => {
    // PNG signature 89 50 4E 47 0D 0A 1A 0A (PNG spec, ISO/IEC 15948 §5.2).
    expect(sniffImageType(bytes('89504e470d0a1a0a 0000000d'))).toBe('image/png');
    // JPEG starts with the SOI marker FF D8 then a marker FF xx (ITU-T T.81 Annex B).
    expect(sniffImageType(bytes('ffd8ffe000104a464946'))).toBe('image/jpeg');
    // GIF header "GIF87a" / "GIF89a" (GIF89a specification §17).
    expect(sniffImageType(ascii('GIF87a\x01\x00'))).toBe('image/gif');
    expect(sniffImageType(ascii('GIF89a\x01\x00'))).toBe('image/gif');
    // WebP: "RIFF", 4-byte size, "WEBP" (RFC 9649 §2.5).
    expect(sniffImageType(ascii('RIFF\x24\x00\x00\x00WEBPVP8 '))).toBe('image/webp');
  });

  it('rejects look-alikes and other files', () => {
    expect(sniffImageType(ascii('<svg xmlns="http://www.w3.org/2000/svg"/>'))).toBeNull();
    expect(sniffImageType(ascii('%PDF-1.7'))).toBeNull();
    expect(sniffImageType(ascii('RIFF\x24\x00\x00\x00WAVEfmt '))).toBeNull();
    expect(sniffImageType(bytes('89504e47'))).toBeNull();
    expect(sniffImageType(new Uint8Array())).toBeNull();
  });
});
