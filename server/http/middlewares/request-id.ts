import { randomUUID } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';

const ACCEPTED = /^[A-Za-z0-9._-]{8,100}$/;

export function requestId(req: Request, res: Response, next: NextFunction): void {
  const incoming = req.header('x-request-id');
  const id = incoming && ACCEPTED.test(incoming) ? incoming : randomUUID();
  res.locals.requestId = id;
  res.setHeader('x-request-id', id);
  next();
}
