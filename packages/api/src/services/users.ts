import bcrypt from 'bcryptjs';
import type { DataSource } from 'typeorm';
import type { SessionUser, UserCreateRequest, UserRecord, UserUpdateRequest } from '@loopwright/contract';
import { User } from '../entities/index.ts';
import { AppError, conflict, invalidInput, notFound } from '../errors.ts';
import type { AuditActor, AuditService } from './audit.ts';
import type { SessionControl } from './sessions.ts';

function identityOf(user: User): Pick<SessionUser, 'id' | 'email' | 'displayName' | 'roles'> {
  return { id: user.id, email: user.email, displayName: user.displayName, roles: [...user.roles] };
}

function toRecord(user: User): UserRecord {
  return {
    ...identityOf(user),
    disabled: user.disabled,
    createdAt: user.createdAt.toISOString(),
    updatedAt: user.updatedAt.toISOString(),
  };
}

export function toSessionUser(user: User): SessionUser {
  return { ...identityOf(user), organizationId: user.organizationId };
}

function isDuplicateKey(err: unknown): boolean {
  return (err as { driverError?: { code?: string } }).driverError?.code === 'ER_DUP_ENTRY';
}

export class UserService {
  /** Compared against when the e-mail is unknown, so both failures cost one bcrypt comparison. */
  private readonly dummyHash: string;

  constructor(
    private readonly dataSource: DataSource,
    private readonly audit: AuditService,
    private readonly sessions: SessionControl,
    private readonly bcryptRounds: number,
  ) {
    this.dummyHash = bcrypt.hashSync('not-a-real-password', bcryptRounds);
  }

  private get repo() {
    return this.dataSource.getRepository(User);
  }

  hashPassword(password: string): Promise<string> {
    return bcrypt.hash(password, this.bcryptRounds);
  }

  /** The user for a correct e-mail and password of an enabled account, else null (no hint which). */
  async verifyCredentials(email: string, password: string): Promise<SessionUser | null> {
    const user = await this.repo.findOneBy({ email: email.toLowerCase() });
    const matches = await bcrypt.compare(password, user?.passwordHash ?? this.dummyHash);
    if (!user || !matches || user.disabled) return null;
    return toSessionUser(user);
  }

  /** Which account an e-mail names, if any (to file a failed sign-in under its organisation). */
  async findByEmail(email: string): Promise<{ id: number; organizationId: number } | null> {
    const user = await this.repo.findOne({ where: { email: email.toLowerCase() }, select: { id: true, organizationId: true } });
    return user ? { id: user.id, organizationId: user.organizationId } : null;
  }

  async list(organizationId: number): Promise<UserRecord[]> {
    return (await this.repo.find({ where: { organizationId }, order: { email: 'ASC' } })).map(toRecord);
  }

  async create(organizationId: number, request: UserCreateRequest, actor: AuditActor): Promise<UserRecord> {
    const passwordHash = await this.hashPassword(request.password);
    return this.dataSource.transaction(async (manager) => {
      let id: number;
      try {
        const inserted = await manager.insert(User, {
          organizationId,
          email: request.email,
          displayName: request.displayName,
          passwordHash,
          roles: request.roles,
          disabled: false,
        });
        id = Number(inserted.identifiers[0]?.id);
      } catch (err) {
        if (isDuplicateKey(err)) throw conflict(`an account for ${request.email} already exists`, 'email');
        throw err;
      }
      await this.audit.record(actor, { action: 'user.create', objectType: 'user', objectId: id, detail: { email: request.email, roles: request.roles } }, manager);
      return toRecord(await manager.findOneByOrFail(User, { id }));
    });
  }

  /** Disabling or re-roling ends the account's sessions, so the change applies at once; a rename is written into them. */
  async update(organizationId: number, id: number, request: UserUpdateRequest, actor: AuditActor): Promise<UserRecord> {
    if (actor.id === id && (request.disabled === true || (request.roles && !request.roles.includes('admin')))) {
      throw invalidInput(request.disabled === true ? 'disabled' : 'roles', 'an admin cannot disable or remove the admin role from their own account');
    }
    const record = await this.dataSource.transaction(async (manager) => {
      const user = await manager.findOneBy(User, { id, organizationId });
      if (!user) throw notFound('user');
      const changes: Partial<Pick<User, 'displayName' | 'roles' | 'disabled'>> = {};
      if (request.displayName !== undefined) changes.displayName = request.displayName;
      if (request.roles !== undefined) changes.roles = request.roles;
      if (request.disabled !== undefined) changes.disabled = request.disabled;
      await manager.update(User, { id }, changes);
      await this.audit.record(actor, { action: 'user.update', objectType: 'user', objectId: id, detail: { before: { roles: user.roles, disabled: user.disabled }, changes } }, manager);
      return toRecord(await manager.findOneByOrFail(User, { id }));
    });
    if (request.roles !== undefined || request.disabled === true) await this.sessions.endSessionsOf(id);
    else if (request.displayName !== undefined) await this.sessions.renameIn(id, record.displayName);
    return record;
  }

  /** Checks the current password, stores the new hash and ends the user's other sessions. */
  async changePassword(userId: number, currentPassword: string, newPassword: string, keepSessionId: string, actor: AuditActor): Promise<void> {
    const user = await this.repo.findOneBy({ id: userId });
    if (!user || user.disabled) throw new AppError('unauthenticated', 'sign in first', 401);
    if (!(await bcrypt.compare(currentPassword, user.passwordHash))) {
      throw invalidInput('currentPassword', 'the current password is wrong');
    }
    const passwordHash = await this.hashPassword(newPassword);
    await this.dataSource.transaction(async (manager) => {
      await manager.update(User, { id: userId }, { passwordHash });
      await this.audit.record(actor, { action: 'user.password-change', objectType: 'user', objectId: userId }, manager);
    });
    await this.sessions.endSessionsOf(userId, keepSessionId);
  }
}
