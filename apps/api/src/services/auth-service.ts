import { createSecretKey, type KeyObject } from 'node:crypto';
import argon2 from 'argon2';
import jwt from 'jsonwebtoken';
import { IsNull, MoreThan, type DataSource, type EntityManager } from 'typeorm';
import {
  roleSchema,
  type AcceptInviteInput,
  type ForgotPasswordInput,
  type ResetPasswordInput,
  type Role,
  type SessionDto,
  type SignInInput,
  type SignUpInput,
} from '@hodboard/shared';
import { AuthToken, CrewMember, Crew, Firm, Membership, User, type AuthTokenKind } from '../entities/index.js';
import { errors } from '../errors.js';
import type { Clock } from '../lib/clock.js';
import type { EventBus } from '../lib/event-bus.js';
import { hashToken, newOpaqueToken } from '../lib/tokens.js';
import type { Actor } from './actor.js';
import { recordAudit } from './audit-service.js';
import type { Mailer } from './mailer.js';

export interface AuthSettings {
  jwtSecret: string;
  accessTokenTtlSeconds: number;
  refreshTokenTtlDays: number;
  appUrl: string;
}

export interface IssuedSession {
  session: SessionDto;
  refreshToken: string;
  refreshExpiresAt: Date;
}

interface AccessClaims {
  sub: string;
  mid: string;
  fid: string;
}

const HOUR_MS = 3_600_000;
const RESET_TTL_MS = 1 * HOUR_MS;
const INVITE_TTL_MS = 7 * 24 * HOUR_MS;
// Hash compared against when the e-mail is unknown, so a miss takes as long as a wrong password.
const DUMMY_HASH_PROMISE = argon2.hash('not-a-real-password', { type: argon2.argon2id });

export class AuthService {
  /** A key object, not the string: given a string, jsonwebtoken first tries (and fails) to read it as a public key on every call. */
  private readonly signingKey: KeyObject;

  constructor(
    private readonly dataSource: DataSource,
    private readonly mailer: Mailer,
    private readonly events: EventBus,
    private readonly clock: Clock,
    private readonly settings: AuthSettings,
  ) {
    this.signingKey = createSecretKey(Buffer.from(settings.jwtSecret, 'utf8'));
  }

  async signUp(input: SignUpInput): Promise<IssuedSession> {
    const passwordHash = await hashPassword(input.password);
    return this.dataSource.transaction(async (manager) => {
      if (await manager.existsBy(User, { email: input.email })) {
        throw errors.alreadyExists('An account with this e-mail already exists; sign in instead.');
      }
      const firm = await manager.save(manager.create(Firm, { name: input.firmName }));
      const user = await manager.save(manager.create(User, { email: input.email, name: input.ownerName, passwordHash }));
      const membership = await manager.save(
        manager.create(Membership, { firmId: firm.id, userId: user.id, role: 'owner', status: 'active' }),
      );
      await recordAudit(manager, { firmId: firm.id, userId: user.id }, { entity: 'firm', entityId: firm.id, action: 'created', after: firm });
      return this.issueSession(manager, user, membership, firm);
    });
  }

  async signIn(input: SignInInput): Promise<IssuedSession> {
    const user = await this.dataSource.manager.findOneBy(User, { email: input.email });
    const hash = user?.passwordHash ?? (await DUMMY_HASH_PROMISE);
    const matches = await argon2.verify(hash, input.password);
    if (!user || !user.passwordHash || !matches) throw errors.badCredentials();
    const membership = await this.dataSource.manager.findOne(Membership, {
      where: { userId: user.id, status: 'active' },
      relations: { firm: true },
      order: { createdAt: 'DESC' },
    });
    if (!membership) throw errors.badCredentials();
    return this.dataSource.transaction((manager) => this.issueSession(manager, user, membership, membership.firm));
  }

  async refresh(refreshToken: string | undefined): Promise<IssuedSession> {
    if (!refreshToken) throw errors.unauthenticated();
    return this.dataSource.transaction(async (manager) => {
      const token = await this.consume(manager, 'refresh', refreshToken);
      const membership = await manager.findOne(Membership, {
        where: { id: token.membershipId ?? '', status: 'active' },
        relations: { user: true, firm: true },
      });
      if (!membership) throw errors.unauthenticated('Your access to this firm has ended.');
      return this.issueSession(manager, membership.user, membership, membership.firm);
    });
  }

  async signOut(refreshToken: string | undefined): Promise<void> {
    if (!refreshToken) return;
    await this.dataSource.manager.update(
      AuthToken,
      { tokenHash: hashToken(refreshToken), kind: 'refresh', usedAt: IsNull() },
      { usedAt: this.clock() },
    );
  }

  async forgotPassword(input: ForgotPasswordInput): Promise<void> {
    const user = await this.dataSource.manager.findOneBy(User, { email: input.email });
    if (!user?.passwordHash) return; // Same answer either way: the response must not reveal who has an account.
    const token = await this.createToken(this.dataSource.manager, 'reset', user.id, null, RESET_TTL_MS);
    const link = `${this.settings.appUrl}/reset-password?token=${encodeURIComponent(token)}`;
    await this.mailer.send({
      to: user.email,
      subject: 'Reset your Hodboard password',
      text: `Hello ${user.name},\n\nSomeone asked to reset the password for this e-mail address. If it was you, choose a new password here (the link works once, for one hour):\n\n${link}\n\nIf it was not you, ignore this message.`,
      html: `<p>Hello ${escapeHtml(user.name)},</p><p>Someone asked to reset the password for this e-mail address. If it was you, <a href="${link}">choose a new password</a> (the link works once, for one hour).</p><p>If it was not you, ignore this message.</p>`,
    });
  }

  async resetPassword(input: ResetPasswordInput): Promise<void> {
    const passwordHash = await hashPassword(input.password);
    await this.dataSource.transaction(async (manager) => {
      const token = await this.consume(manager, 'reset', input.token);
      await manager.update(User, { id: token.userId }, { passwordHash });
      // A new password ends every existing session.
      await manager.update(AuthToken, { userId: token.userId, kind: 'refresh', usedAt: IsNull() }, { usedAt: this.clock() });
    });
  }

  async sendInvite(manager: EntityManager, actor: Actor, membership: Membership, user: User): Promise<void> {
    const token = await this.createToken(manager, 'invite', user.id, membership.id, INVITE_TTL_MS);
    const firm = await manager.findOneByOrFail(Firm, { id: actor.firmId });
    const link = `${this.settings.appUrl}/accept-invite?token=${encodeURIComponent(token)}`;
    await this.mailer.send({
      to: user.email,
      subject: `You are invited to ${firm.name} on Hodboard`,
      text: `Hello ${user.name},\n\n${firm.name} has added you to Hodboard. Set your password to start (the link works once, for seven days):\n\n${link}\n`,
      html: `<p>Hello ${escapeHtml(user.name)},</p><p>${escapeHtml(firm.name)} has added you to Hodboard. <a href="${link}">Set your password to start</a> (the link works once, for seven days).</p>`,
    });
  }

  async acceptInvite(input: AcceptInviteInput): Promise<IssuedSession> {
    const passwordHash = await hashPassword(input.password);
    const accepted = await this.dataSource.transaction(async (manager) => {
      const token = await this.consume(manager, 'invite', input.token);
      const membership = await manager.findOne(Membership, {
        where: { id: token.membershipId ?? '' },
        relations: { user: true, firm: true },
      });
      if (!membership) throw errors.tokenInvalid('This invitation was withdrawn.');
      membership.status = 'active';
      await manager.save(membership);
      membership.user.name = input.name;
      membership.user.passwordHash = passwordHash;
      await manager.save(membership.user);
      await recordAudit(manager, { firmId: membership.firmId, userId: membership.userId }, {
        entity: 'membership', entityId: membership.id, action: 'invite-accepted',
      });
      return { membershipId: membership.id, firmId: membership.firmId, issued: await this.issueSession(manager, membership.user, membership, membership.firm) };
    });
    // The person's name is now theirs, wherever it shows (a crew's leave on the board among them).
    this.events.publish({ firmId: accepted.firmId, type: 'member:changed', id: accepted.membershipId });
    return accepted.issued;
  }

  /** Verifies an access token and reloads the membership, so a removed person or changed role takes effect at once. */
  async authenticate(accessToken: string): Promise<Actor> {
    let claims: AccessClaims;
    try {
      claims = jwt.verify(accessToken, this.signingKey, { algorithms: ['HS256'] }) as AccessClaims;
    } catch (error) {
      if (error instanceof jwt.TokenExpiredError) throw errors.tokenExpired('Your session has expired; sign in again.');
      throw errors.tokenInvalid('Your session is not valid; sign in again.');
    }
    return this.currentActor({ userId: claims.sub, firmId: claims.fid, membershipId: claims.mid });
  }

  /** The membership as the database holds it now: its role and crews, whatever a token or an open socket was given earlier. */
  async currentActor(who: Pick<Actor, 'userId' | 'firmId' | 'membershipId'>): Promise<Actor> {
    // Every authenticated request runs this, so it is one statement: the membership and its crews together.
    const rows: Array<{ user_id: string; firm_id: string; role: string; crew_ids: string }> = await this.dataSource.query(
      `SELECT m.user_id, m.firm_id, m.role,
              array_to_string(ARRAY(
                SELECT cm.crew_id FROM crew_member cm WHERE cm.member_id = m.id AND cm.firm_id = m.firm_id
                UNION
                SELECT c.id FROM crew c WHERE c.lead_member_id = m.id AND c.firm_id = m.firm_id
              ), ',') AS crew_ids
         FROM membership m
        WHERE m.id = $1 AND m.status = 'active'`,
      [who.membershipId],
    );
    const membership = rows[0];
    if (!membership || membership.user_id !== who.userId || membership.firm_id !== who.firmId) {
      throw errors.unauthenticated('Your access to this firm has ended.');
    }
    return {
      userId: membership.user_id,
      firmId: membership.firm_id,
      membershipId: who.membershipId,
      role: roleSchema.parse(membership.role),
      crewIds: membership.crew_ids ? membership.crew_ids.split(',') : [],
    };
  }

  async sessionFor(actor: Actor): Promise<Omit<SessionDto, 'accessToken' | 'expiresIn'>> {
    const membership = await this.dataSource.manager.findOneOrFail(Membership, {
      where: { id: actor.membershipId },
      relations: { user: true, firm: true },
    });
    return this.describe(membership.user, membership, membership.firm, actor.crewIds);
  }

  private async issueSession(manager: EntityManager, user: User, membership: Membership, firm: Firm): Promise<IssuedSession> {
    const claims: AccessClaims = { sub: user.id, mid: membership.id, fid: firm.id };
    const accessToken = jwt.sign(claims, this.signingKey, {
      algorithm: 'HS256',
      expiresIn: this.settings.accessTokenTtlSeconds,
    });
    const refreshTtlMs = this.settings.refreshTokenTtlDays * 24 * HOUR_MS;
    const refreshToken = await this.createToken(manager, 'refresh', user.id, membership.id, refreshTtlMs);
    const crewIds = await crewIdsOf(manager, membership);
    return {
      session: { accessToken, expiresIn: this.settings.accessTokenTtlSeconds, ...this.describe(user, membership, firm, crewIds) },
      refreshToken,
      refreshExpiresAt: new Date(this.clock().getTime() + refreshTtlMs),
    };
  }

  private describe(user: User, membership: Membership, firm: Firm, crewIds: string[]) {
    return {
      user: { id: user.id, name: user.name, email: user.email },
      firm: { id: firm.id, name: firm.name },
      role: roleSchema.parse(membership.role) as Role,
      crewIds,
    };
  }

  private async createToken(
    manager: EntityManager,
    kind: AuthTokenKind,
    userId: string,
    membershipId: string | null,
    ttlMs: number,
  ): Promise<string> {
    const token = newOpaqueToken();
    await manager.insert(AuthToken, {
      kind,
      tokenHash: hashToken(token),
      userId,
      membershipId,
      expiresAt: new Date(this.clock().getTime() + ttlMs),
    });
    return token;
  }

  /** Marks a token used in the same statement that checks it, so two requests can never both spend it. */
  private async consume(manager: EntityManager, kind: AuthTokenKind, secret: string): Promise<AuthToken> {
    const now = this.clock();
    const result = await manager
      .createQueryBuilder()
      .update(AuthToken)
      .set({ usedAt: now })
      .where({ tokenHash: hashToken(secret), kind, usedAt: IsNull(), expiresAt: MoreThan(now) })
      .returning('*')
      .execute();
    const raw = (result.raw as Record<string, unknown>[])[0];
    if (!raw) {
      const known = await manager.findOneBy(AuthToken, { tokenHash: hashToken(secret), kind });
      if (known && !known.usedAt && known.expiresAt <= now) throw errors.tokenExpired();
      throw kind === 'refresh' ? errors.unauthenticated('Your session has ended; sign in again.') : errors.tokenInvalid();
    }
    return manager.create(AuthToken, {
      id: raw.id as string,
      kind,
      userId: raw.user_id as string,
      membershipId: (raw.membership_id as string | null) ?? null,
    });
  }
}

export async function crewIdsOf(manager: EntityManager, membership: Pick<Membership, 'id' | 'firmId'>): Promise<string[]> {
  const memberRows = await manager.find(CrewMember, { where: { memberId: membership.id, firmId: membership.firmId }, select: { crewId: true } });
  const ledRows = await manager.find(Crew, { where: { leadMemberId: membership.id, firmId: membership.firmId }, select: { id: true } });
  return [...new Set([...memberRows.map((row) => row.crewId), ...ledRows.map((row) => row.id)])];
}

function hashPassword(password: string): Promise<string> {
  return argon2.hash(password, { type: argon2.argon2id });
}

export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}
