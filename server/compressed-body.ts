import type { Request, Response } from 'express';
import zlib from 'node:zlib';

export type Encoding = 'br' | 'gzip';

/**
 * The compressions a request accepts. Only the names are read (a `q=0` is not honoured): every
 * browser that sends either name accepts it.
 */
export function acceptedEncodings(req: Request): Record<Encoding, boolean> {
  const accepts = req.get('accept-encoding') ?? '';
  return { br: /\bbr\b/.test(accepts), gzip: /\bgzip\b/.test(accepts) };
}

/** Below this a compressed answer saves less than its headers and CPU cost. */
const MIN_BYTES = 1024;

/**
 * A JSON answer that is served many times unchanged (the board, a flowsheet), kept as bytes and
 * compressed at most once per encoding, on first demand. A board is about 50 KB of JSON and 5 KB
 * compressed: on a ward's Wi-Fi the difference is what a nurse waits for, and on the server the
 * fewer bytes written per poll are most of a cached read's cost. Compressing per request (as the
 * `compression` middleware does for the API's other answers, and leaves these alone) would cost
 * more than the read itself, so it happens here, once per build. Brotli runs at a middle quality:
 * a cache entry lives about a second, not a whole server run.
 */
export class CompressedJson {
  private readonly raw: Buffer;
  private readonly encoded: Partial<Record<Encoding, Buffer>> = {};

  constructor(json: string) {
    this.raw = Buffer.from(json, 'utf8');
  }

  /** The bytes for an encoding, compressed the first time they are asked for. */
  private bytes(encoding: Encoding | null): Buffer {
    if (encoding === null) return this.raw;
    let body = this.encoded[encoding];
    if (!body) {
      body =
        encoding === 'br'
          ? zlib.brotliCompressSync(this.raw, {
              params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 5, [zlib.constants.BROTLI_PARAM_SIZE_HINT]: this.raw.length },
            })
          : zlib.gzipSync(this.raw, { level: 6 });
      this.encoded[encoding] = body;
    }
    return body;
  }

  /** Sends the answer in the best encoding the request accepts. */
  send(req: Request, res: Response): void {
    const accepts = acceptedEncodings(req);
    const encoding = this.raw.length < MIN_BYTES ? null : accepts.br ? 'br' : accepts.gzip ? 'gzip' : null;
    const body = this.bytes(encoding);
    res.set('Content-Type', 'application/json; charset=utf-8');
    res.set('Vary', 'Accept-Encoding');
    if (encoding) res.set('Content-Encoding', encoding);
    res.set('Content-Length', String(body.length));
    res.end(req.method === 'HEAD' ? undefined : body);
  }
}
