import request from 'supertest';
import type { Express } from 'express';
import { DEMO_PASSWORD } from './demo';

/** Signs in and returns a supertest agent that carries the session cookie and the client header. */
export async function signedIn(app: Express, email: string, password = DEMO_PASSWORD) {
  const agent = request.agent(app);
  const res = await agent.post('/api/auth/login').set('content-type', 'application/json').send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return agent;
}
