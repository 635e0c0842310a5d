import type { AssetType } from '@/lib/schemas/drills';

/**
 * The image type from the file's first bytes (its magic number), never from the name or the
 * client's content type. Signatures: PNG "\x89PNG\r\n\x1a\n" (PNG spec, ISO/IEC 15948 §5.2);
 * JPEG SOI marker FF D8 FF (ITU-T T.81 / JFIF); GIF "GIF87a"/"GIF89a" (GIF89a spec);
 * WebP "RIFF"....“WEBP” (RFC 9649 §2). Anything else is not an image we store.
 */
export function sniffImageType(bytes: Uint8Array): AssetType | null {
  const b = bytes;
  const ascii = (from: number, to: number) => String.fromCharCode(...b.subarray(from, to));
  if (b.length >= 8 && b[0] === 0x89 && ascii(1, 4) === 'PNG' && b[4] === 0x0d && b[5] === 0x0a && b[6] === 0x1a && b[7] === 0x0a) return 'image/png';
  if (b.length >= 3 && b[0] === 0xff && b[1] === 0xd8 && b[2] === 0xff) return 'image/jpeg';
  if (b.length >= 6 && (ascii(0, 6) === 'GIF87a' || ascii(0, 6) === 'GIF89a')) return 'image/gif';
  if (b.length >= 12 && ascii(0, 4) === 'RIFF' && ascii(8, 12) === 'WEBP') return 'image/webp';
  return null;
}
