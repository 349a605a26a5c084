import { createHash } from 'node:crypto';
import type { Request, Response } from 'express';
import type { TaggedBody } from '../services/results';

/**
 * Sends a body with an entity tag; a matching If-None-Match gets 304 before any body is made (Express's `req.fresh`
 * compares the request's validators with the response's ETag header).
 */
export function sendTagged(req: Request, res: Response, tagged: TaggedBody): void {
  res.setHeader('ETag', `"${createHash('sha1').update(tagged.etagSource).digest('base64url')}"`);
  if (req.fresh) {
    res.status(304).end();
    return;
  }
  res.setHeader('Content-Type', 'application/json; charset=utf-8');
  res.status(200).send(tagged.body());
}
