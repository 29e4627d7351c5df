/**
 * `POST /api/<method>`: the token, the allowlist, a JSON body of bounded size, then the call through
 * the dispatcher (which checks the payload against the method's schema before anything runs).
 *
 *   200 the response (wire encoding, channels.ts)      401 no token, or a wrong one
 *   400 malformed JSON, or a payload or request the     404 not a method of the allowlist
 *       service refused: { error, reason?, field? }    405 not POST     413 body too large
 *   415 not application/json (a cross-site form cannot send that without a preflight)
 *   500 { error: generic message }; the stack goes to the log
 */
import type { IncomingMessage, ServerResponse } from 'node:http';
import { SERVICE_METHODS } from '../../shared/contract/channels.js';
import type { Dispatcher } from '../../shared/contract/dispatch.js';
import { tokenMatches, tokenOf } from './guard.js';
import { sendError, sendJson } from './headers.js';

export const API_PREFIX = '/api/';

export interface ApiContext {
  dispatch: Dispatcher;
  token: string;
  maxBodyBytes: number;
  log(text: string): void;
}

export async function handleApi(req: IncomingMessage, res: ServerResponse, ctx: ApiContext): Promise<void> {
  if (req.method !== 'POST') return sendError(res, 405, 'the API takes POST with a JSON body', { Allow: 'POST' });
  if (!tokenMatches(tokenOf(req.headers), ctx.token)) {
    return sendError(res, 401, 'missing or wrong token: send the token printed by `tauwell serve` as "Authorization: Bearer <token>"', { 'WWW-Authenticate': 'Bearer' });
  }
  const method = (req.url ?? '').split(/[?#]/, 1)[0].slice(API_PREFIX.length);
  if (!(SERVICE_METHODS as readonly string[]).includes(method)) {
    return sendError(res, 404, `no API method ${JSON.stringify(method)}; the methods are ${SERVICE_METHODS.join(', ')}`);
  }
  const type = (req.headers['content-type'] ?? '').split(';', 1)[0].trim().toLowerCase();
  if (type !== 'application/json') return sendError(res, 415, 'the request body must be sent as Content-Type: application/json');

  const body = await readBody(req, ctx.maxBodyBytes);
  if (body === 'aborted') return;
  if (body === 'too-large') {
    // Answer first, then drop the connection rather than read the rest of an oversized body.
    res.on('finish', () => req.destroy());
    return sendError(res, 413, `the request body is larger than ${ctx.maxBodyBytes} bytes`, { Connection: 'close' });
  }
  let payload: unknown;
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(body);
    if (text.trim() === '') return sendError(res, 400, 'the request body is empty; send the request as a JSON object ({} for none)');
    payload = JSON.parse(text);
  } catch (e) {
    const why = e instanceof SyntaxError ? e.message.replace(/\s+/g, ' ') : 'it is not UTF-8 text';
    return sendError(res, 400, `the request body is not valid JSON: ${why}`);
  }

  const outcome = await ctx.dispatch(method, payload);
  if (outcome.ok) return sendJson(res, 200, outcome.value);
  switch (outcome.kind) {
    case 'input':
      return sendJson(res, 400, { error: outcome.error, reason: outcome.reason, ...(outcome.field !== undefined ? { field: outcome.field } : {}) });
    case 'unknown-method':
      return sendError(res, 404, outcome.error);
    case 'internal': {
      const c = outcome.cause;
      ctx.log(`tauwell serve: internal error in ${outcome.method}: ${c instanceof Error ? (c.stack ?? c.message) : String(c)}\n`);
      return sendError(res, 500, outcome.error);
    }
  }
}

/**
 * The whole body; 'too-large' as soon as it passes `limit` bytes (declared or received); 'aborted'
 * when the client went away meanwhile (nobody is left to answer).
 */
async function readBody(req: IncomingMessage, limit: number): Promise<Buffer | 'too-large' | 'aborted'> {
  const declared = Number(req.headers['content-length']);
  if (Number.isFinite(declared) && declared > limit) return 'too-large';
  const chunks: Buffer[] = [];
  let size = 0;
  try {
    for await (const chunk of req) {
      const buf = chunk as Buffer;
      size += buf.length;
      if (size > limit) return 'too-large';
      chunks.push(buf);
    }
  } catch {
    return 'aborted';
  }
  return Buffer.concat(chunks);
}
