/**
 * The loader's bad-byte finder, used to name the line of a non-UTF-8 byte, against the strict
 * UTF-8 decoder of Node (the WHATWG Encoding Standard's decoder, `TextDecoder` with fatal: true)
 * on random byte strings; and the line and byte it reports when a file arrives in chunks that
 * cut characters in two.
 */
import fc from 'fast-check';
import { Readable } from 'node:stream';
import { describe, expect, it } from 'vitest';
import { firstBadUtf8, loadCsv } from '../../src/data/load-csv.js';

const FC = { seed: 0x5e7f8, numRuns: 3000 } as const;

function decodes(bytes: Uint8Array, stream: boolean): boolean {
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes, { stream });
    return true;
  } catch {
    return false;
  }
}

/** Random bytes biased towards the interesting ranges: ASCII, continuation bytes and lead bytes. */
const arbBytes = fc
  .array(
    fc.oneof(
      fc.integer({ min: 0x20, max: 0x7e }),
      fc.integer({ min: 0x80, max: 0xbf }),
      fc.integer({ min: 0xc0, max: 0xff }),
      fc.constantFrom(0xe0, 0xed, 0xf0, 0xf4, 0xa0, 0x9f, 0x90, 0x8f),
    ),
    { maxLength: 24 },
  )
  .map((a) => Uint8Array.from(a));

describe('firstBadUtf8 agrees with the strict WHATWG decoder', () => {
  it('finds no bad byte exactly when the bytes decode (an unfinished last character allowed)', () => {
    fc.assert(
      fc.property(arbBytes, (bytes) => {
        expect(firstBadUtf8(bytes) === -1).toBe(decodes(bytes, true));
      }),
      FC,
    );
  });

  it('the bytes before the bad byte decode, and the bad byte is the one the decoder stops at', () => {
    fc.assert(
      fc.property(arbBytes, (bytes) => {
        const k = firstBadUtf8(bytes);
        if (k < 0) return;
        expect(decodes(bytes.subarray(0, k), false)).toBe(true);
        // the decoder accepts the bytes up to k but not up to the end of the sequence begun at k
        expect(decodes(bytes.subarray(0, Math.min(bytes.length, k + 4)), true)).toBe(false);
      }),
      FC,
    );
  });

  it('accepts well-formed text of any code points', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme', maxLength: 20 }), (text) => {
        expect(firstBadUtf8(Buffer.from(text, 'utf8'))).toBe(-1);
      }),
      FC,
    );
  });
});

describe('the loader names the line and byte of a bad byte, whatever the chunks', () => {
  const good = 'a,b,y\n1,é,p\n2,😀,q\n3,δ,p\n';
  const bad = Buffer.concat([Buffer.from(good), Buffer.from('4,'), Buffer.from([0xe2, 0x28, 0xa1]), Buffer.from(',q\n')]);
  // the bad byte: 0xe2 starts a three-byte character, 0x28 cannot continue it; reported at 0xe2
  const at = Buffer.byteLength(good) + 2;

  it.each([1, 2, 3, 5, 7, 64])('in chunks of %i bytes', async (size) => {
    const chunks: Buffer[] = [];
    for (let i = 0; i < bad.length; i += size) chunks.push(bad.subarray(i, i + size));
    await expect(loadCsv({ stream: Readable.from(chunks), name: 'c.csv' })).rejects.toThrow(/^c\.csv: is not valid UTF-8 \(line 5, byte (\d+)\)/);
    const message = await loadCsv({ stream: Readable.from(chunks), name: 'c.csv' }).then(
      () => '',
      (e: Error) => e.message,
    );
    expect(Number(/byte (\d+)/.exec(message)![1])).toBe(at);
    // the same text, well formed, loads in the same chunks with its multi-byte characters whole
    const fine: Buffer[] = [];
    const ok = Buffer.from(good);
    for (let i = 0; i < ok.length; i += size) fine.push(ok.subarray(i, i + size));
    const t = await loadCsv({ stream: Readable.from(fine), name: 'c.csv' });
    const b = t.byName.get('b')!;
    expect(b.kind === 'categorical' && b.levels).toEqual(['é', '😀', 'δ']);
  });

  it('a file that ends inside a character names its last line', async () => {
    const cut = Buffer.concat([Buffer.from('a,y\n1,p\n2,'), Buffer.from([0xf0, 0x9f])]);
    await expect(loadCsv({ stream: Readable.from([cut]), name: 'e.csv' })).rejects.toThrow(/^e\.csv: is not valid UTF-8 \(line 3: the file ends inside a character\)/);
  });
});
