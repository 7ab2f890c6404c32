import { createHash, randomBytes } from 'node:crypto';
import bcrypt from 'bcryptjs';
import jwt from 'jsonwebtoken';
import type { MeResponse } from '../../../shared/schemas/auth.schema';
import type { AuthUser } from '../../http/auth-context';
import { badRequest, notFound, unauthorized } from '../../http/errors';
import type { Logger } from '../../lib/logger';
import type { NotificationsService } from '../notifications/notifications.service';
import type { AuthRepository } from './auth.repository';
import { presentMe } from './auth.presenter';

export const BCRYPT_COST = 11;
export const JWT_AUDIENCE = 'gillwise-web';
export const JWT_ISSUER = 'gillwise';
const RESET_TTL_MS = 60 * 60 * 1000;
const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000;
// A real hash to compare against when the e-mail is unknown, so timing does not reveal which e-mails exist.
const DUMMY_HASH = bcrypt.hashSync('not-a-real-password', BCRYPT_COST);

type TokenClaims = { sub: string; tv: number; iat: number; exp: number };

export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

export class AuthService {
  constructor(
    private readonly repo: AuthRepository,
    private readonly notifications: NotificationsService,
    private readonly options: { jwtSecret: string; jwtTtlSeconds: number; publicUrl: string },
    private readonly logger: Logger,
  ) {}

  static hashPassword(password: string): Promise<string> {
    return bcrypt.hash(password, BCRYPT_COST);
  }

  async login(email: string, password: string): Promise<{ token: string; me: MeResponse }> {
    const user = await this.repo.findUserByEmail(email);
    const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
    if (!user || !user.passwordHash || !ok || !user.active) {
      throw unauthorized('That e-mail and password do not match an active account.', 'invalid_credentials');
    }
    await this.repo.touchLogin(user.id);
    return { token: this.issueToken(user.id, user.tokenVersion), me: presentMe(user, await this.repo.farmsOf(user)) };
  }

  issueToken(userId: string, tokenVersion: number): string {
    return jwt.sign({ tv: tokenVersion }, this.options.jwtSecret, {
      algorithm: 'HS256',
      subject: userId,
      audience: JWT_AUDIENCE,
      issuer: JWT_ISSUER,
      expiresIn: this.options.jwtTtlSeconds,
    });
  }

  /** Verifies a session token (signature, algorithm, audience, issuer, expiry, token version). */
  async authenticate(token: string): Promise<AuthUser | null> {
    let claims: TokenClaims;
    try {
      claims = jwt.verify(token, this.options.jwtSecret, {
        algorithms: ['HS256'],
        audience: JWT_AUDIENCE,
        issuer: JWT_ISSUER,
      }) as TokenClaims;
    } catch {
      return null;
    }
    const user = await this.repo.findUserById(claims.sub);
    if (!user || !user.active || user.tokenVersion !== claims.tv) return null;
    const memberships = await this.repo.membershipsOf(user.id);
    return {
      id: user.id,
      email: user.email,
      isAdmin: user.isAdmin,
      memberships: new Map(memberships.map((m) => [m.farmId, m.role])),
      tokenIssuedAt: claims.iat * 1000,
      tokenVersion: user.tokenVersion,
    };
  }

  /** Whether a token is old enough to be renewed (sliding session): past half its lifetime. */
  shouldRenew(user: AuthUser, now = Date.now()): boolean {
    return now - user.tokenIssuedAt > (this.options.jwtTtlSeconds * 1000) / 2;
  }

  async me(userId: string): Promise<MeResponse> {
    const user = await this.repo.findUserById(userId);
    if (!user) throw notFound('User');
    return presentMe(user, await this.repo.farmsOf(user));
  }

  async updateMe(userId: string, patch: { name?: string; locale?: 'en' | 'es'; prefs?: Record<string, string> }): Promise<MeResponse> {
    const user = await this.repo.findUserById(userId);
    if (!user) throw notFound('User');
    if (patch.name !== undefined) user.name = patch.name;
    if (patch.locale !== undefined) user.locale = patch.locale;
    if (patch.prefs) user.prefs = { ...user.prefs, ...patch.prefs };
    await this.repo.saveUser(user);
    return presentMe(user, await this.repo.farmsOf(user));
  }

  /** Always resolves the same way whether or not the e-mail exists (no enumeration). */
  async requestPasswordReset(email: string): Promise<void> {
    const user = await this.repo.findUserByEmail(email);
    if (!user || !user.active) return;
    const token = await this.createSingleUseToken(user.id, 'reset');
    const link = `${this.options.publicUrl}/reset-password?token=${encodeURIComponent(token)}`;
    await this.notifications
      .send({
        farmId: null,
        kind: 'password_reset',
        to: user.email,
        subject: 'Gillwise: reset your password',
        text: [
          `Hello ${user.name},`,
          '',
          'Someone asked to reset the password of your Gillwise account. If it was you, open this link within an hour:',
          link,
          '',
          'The link works once. If you did not ask, ignore this message: your password stays as it is.',
        ].join('\n'),
      })
      .catch((err: unknown) => this.logger.warn({ err }, 'password reset e-mail not delivered'));
  }

  async createSingleUseToken(userId: string, purpose: 'reset' | 'invite'): Promise<string> {
    const token = randomBytes(32).toString('base64url');
    await this.repo.createToken({
      userId,
      tokenHash: hashToken(token),
      purpose,
      expiresAt: new Date(Date.now() + (purpose === 'invite' ? INVITE_TTL_MS : RESET_TTL_MS)),
    });
    return token;
  }

  async confirmPasswordReset(token: string, password: string): Promise<void> {
    const row = await this.repo.findUsableToken(hashToken(token));
    const invalid = badRequest('This link has expired or was already used. Ask for a new one.', undefined, 'invalid_token');
    if (!row) throw invalid;
    const ok = await this.repo.consumeTokenAndSetPassword(row.id, row.userId, await AuthService.hashPassword(password));
    if (!ok) throw invalid;
  }
}
