import { analyzeUnknownRead } from '../../src/core/analyze-read.ts';
import type { ReadAnalysis } from '../../src/core/analyze-read.ts';
import { readInputFor } from '../../src/core/read-derivation.ts';
import { fieldErrorsFromZod } from '../../src/core/read-input.ts';
import type { Change, ChangeKind, SignedRead, Stay } from '../../src/core/records.ts';
import { changeSchema } from '../../src/core/records.ts';
import type { SyncFetch } from '../../src/sync/server-call.ts';

/** One answer as the fake remembers it, so a repeated change id answers exactly as the first time. */
interface Answer {
  changeId: string | null;
  status: 'accepted' | 'rejected';
  seq?: number;
  reason?: string;
  errors?: Array<{ field: string; message: string }>;
  retryable?: boolean;
}

/** One change in the fake unit's log. */
export interface LoggedChange {
  seq: number;
  changeId: string;
  kind: ChangeKind;
  record: { id: string };
  derived: ReadAnalysis | null;
  serverTimeMs: number;
  deviceTimeMs: number;
  committed: boolean;
}

/** A fault to inject into the next push that reaches the server. */
export type PushFault =
  | { kind: 'status'; status: number }
  /** The server applies the whole push, then the answer is lost on the way back. */
  | { kind: 'lose-answer' }
  /** The connection dies after the first `applied` changes were applied; the answer is lost. */
  | { kind: 'partial'; applied: number }
  /** The request is held on the way; `deliver()` hands it to the server later (after the tablet gave up on it). */
  | { kind: 'delay'; onHeld: (deliver: () => Promise<void>) => void };

interface User {
  id: string;
  name: string;
  username: string;
  role: 'nurse' | 'charge-nurse' | 'unit-admin';
  unitId: string;
  password: string;
}

/**
 * An in-memory unit server keeping the push/pull contract: every change id applied at most once,
 * a dense seq per accepted change, and pulls that never return a gap (only changes up to the
 * highest seq below which everything has committed), like the real server.
 */
export class FakeUnitServer {
  readonly log: LoggedChange[] = [];
  readonly reads = new Map<string, SignedRead>();
  readonly amendments = new Map<string, { id: string; readId: string }>();
  readonly stays = new Map<string, Stay>();
  readonly records = new Map<string, unknown>();
  readonly answers = new Map<string, Answer>();
  readonly sessions = new Map<string, User>();
  readonly users: User[] = [];
  /** Every call that reached the server, signed in or not. */
  requests = 0;
  pushRequests = 0;
  pullRequests = 0;
  /** Device tokens the server knows; a test removes one to stand for a withdrawn tablet or a restore that lost it. */
  readonly enrolledTokens = new Set<string>(['device-token-1']);
  /** Changes per push the fake has seen, in order. */
  readonly batchSizes: number[] = [];
  serverNowMs: number;
  private nextSeq = 1;
  private readonly faults: PushFault[] = [];
  /** Changes whose commit waits for `releaseCommits()`, as a test of late commits. */
  holdCommitWhen: ((change: Change) => boolean) | null = null;
  private readonly heldCommits: Array<() => void> = [];
  /** Refuses a change: for good (a reason), or for now only ({ reason, retryable: true }), which is not remembered. */
  rejectWhen: ((change: Change) => string | { reason: string; retryable: true } | null) | null = null;
  private tokenCount = 0;

  constructor(serverNowMs: number, readonly unitId: string) {
    this.serverNowMs = serverNowMs;
  }

  addUser(user: Omit<User, 'unitId'> & { unitId?: string }): User {
    const full = { unitId: this.unitId, ...user };
    this.users.push(full);
    return full;
  }

  /** A session for a user without a sign-in call, as if the tablet had signed in earlier. */
  sessionFor(userId: string): string {
    const user = this.users.find((u) => u.id === userId);
    if (!user) throw new Error(`no user ${userId}`);
    this.tokenCount += 1;
    const token = `session-${this.tokenCount}`;
    this.sessions.set(token, user);
    return token;
  }

  /** Ends every session, as an expiry would. */
  expireSessions(): void {
    this.sessions.clear();
  }

  injectPushFault(fault: PushFault): void {
    this.faults.push(fault);
  }

  /** Lets every held commit finish, in the order their seqs were handed out. */
  releaseCommits(): void {
    for (const release of this.heldCommits.splice(0)) release();
  }

  /** The highest seq below which every change has committed: pulls never go past it. */
  visibleSeq(): number {
    let seq = 0;
    for (const entry of this.log) {
      if (entry.seq !== seq + 1 || !entry.committed) break;
      seq = entry.seq;
    }
    return seq;
  }

  /** Applies changes made elsewhere (an admin's set-up, another tablet), as the server would. */
  async preload(changes: readonly Change[]): Promise<void> {
    for (const change of changes) await this.applyOne(change);
  }

  readsOfStay(stayId: string): SignedRead[] {
    return [...this.reads.values()].filter((r) => r.stayId === stayId);
  }

  private derive(read: SignedRead): ReadAnalysis | null {
    const stay = this.stays.get(read.stayId);
    if (!stay) return null;
    const result = analyzeUnknownRead(readInputFor(read.counts, stay));
    return result.ok ? result.value : null;
  }

  private async applyOne(raw: unknown): Promise<Answer> {
    const changeId = typeof (raw as { changeId?: unknown })?.changeId === 'string' ? (raw as { changeId: string }).changeId : null;
    if (changeId !== null) {
      const earlier = this.answers.get(changeId);
      if (earlier) return earlier;
    }
    const parsed = changeSchema.safeParse(raw);
    if (!parsed.success) return { changeId, status: 'rejected', reason: 'The change did not pass the unit server checks.', errors: fieldErrorsFromZod(parsed.error) };
    const change = parsed.data;
    const refusal = this.rejectWhen?.(change) ?? null;
    if (typeof refusal === 'string') {
      const answer: Answer = { changeId: change.changeId, status: 'rejected', reason: refusal };
      this.answers.set(change.changeId, answer);
      return answer;
    }
    if (refusal) return { changeId: change.changeId, status: 'rejected', reason: refusal.reason, retryable: true };
    if (change.kind === 'read.sign' && this.reads.has(change.record.id)) {
      // A read is immutable: the same read under a new change id is already here.
      const answer: Answer = { changeId: change.changeId, status: 'accepted', seq: this.log.find((l) => l.record.id === change.record.id)!.seq };
      this.answers.set(change.changeId, answer);
      return answer;
    }
    const seq = this.nextSeq;
    this.nextSeq += 1;
    const entry: LoggedChange = {
      seq,
      changeId: change.changeId,
      kind: change.kind,
      record: change.record,
      derived: change.kind === 'read.sign' ? this.derive(change.record) : null,
      serverTimeMs: this.serverNowMs,
      deviceTimeMs: change.deviceTimeMs,
      committed: false,
    };
    this.log.push(entry);
    this.log.sort((a, b) => a.seq - b.seq);
    const answer: Answer = { changeId: change.changeId, status: 'accepted', seq };
    this.answers.set(change.changeId, answer);
    if (change.kind === 'read.sign') this.reads.set(change.record.id, change.record);
    else if (change.kind === 'amendment.add') this.amendments.set(change.record.id, change.record);
    else if (change.kind === 'stay.put') this.stays.set(change.record.id, change.record);
    this.records.set(`${change.kind}:${change.record.id}`, change.record);
    if (this.holdCommitWhen?.(change)) await new Promise<void>((resolve) => this.heldCommits.push(resolve));
    entry.committed = true;
    return answer;
  }

  private userOf(headers: Record<string, string>): User | undefined {
    const auth = headers.authorization ?? '';
    return this.sessions.get(auth.replace(/^Bearer /, ''));
  }

  private async push(body: unknown, fault: PushFault | undefined): Promise<{ status: number; body: unknown }> {
    const changes = (body as { changes?: unknown })?.changes;
    if (!Array.isArray(changes) || changes.length > 200) return { status: 400, body: { errors: [{ field: 'changes', message: 'changes must be a list of at most 200 changes' }] } };
    this.batchSizes.push(changes.length);
    const limit = fault?.kind === 'partial' ? fault.applied : changes.length;
    const results: Answer[] = [];
    for (const raw of changes.slice(0, limit)) results.push(await this.applyOne(raw));
    if (fault?.kind === 'partial' || fault?.kind === 'lose-answer') throw new TypeError('Failed to fetch');
    return { status: 200, body: { results } };
  }

  private pull(url: URL): { status: number; body: unknown } {
    const after = Number(url.searchParams.get('after') ?? '0');
    const limit = Number(url.searchParams.get('limit') ?? '100');
    const visible = this.visibleSeq();
    const page = this.log.filter((l) => l.seq > after && l.seq <= visible).slice(0, limit);
    const last = page.at(-1)?.seq ?? after;
    return {
      status: 200,
      body: {
        changes: page.map((l) => ({ seq: l.seq, kind: l.kind, record: l.record, serverTimeMs: l.serverTimeMs, ...(l.derived ? { derived: l.derived } : {}) })),
        cursor: last,
        hasMore: last < visible,
      },
    };
  }

  /** The server as the tablet's fetch; network failures are thrown like the browser's TypeError. */
  readonly fetch: SyncFetch = async (rawUrl, init) => {
    this.requests += 1;
    const url = new URL(rawUrl, 'http://unit.test');
    const body = init.body === undefined ? undefined : JSON.parse(init.body);
    const reply = (status: number, payload: unknown) => ({ status, json: async () => payload });
    if (url.pathname === '/api/auth/sign-in') {
      const user = this.users.find((u) => u.username === body?.username && u.password === body?.password);
      if (!user) return reply(401, { error: 'bad credentials' });
      this.tokenCount += 1;
      const token = `session-${this.tokenCount}`;
      this.sessions.set(token, user);
      const { password: _password, ...publicUser } = user;
      return reply(200, { token, expiresAtMs: this.serverNowMs + 12 * 3_600_000, user: publicUser });
    }
    const user = this.userOf(init.headers);
    if (!user) return reply(401, { error: 'sign in again' });
    if (url.pathname === '/api/auth/sign-out') {
      this.sessions.delete((init.headers.authorization ?? '').replace(/^Bearer /, ''));
      return { status: 204, json: async () => { throw new SyntaxError('no body'); } };
    }
    if (url.pathname === '/api/devices/enroll') {
      if (user.role !== 'unit-admin') return reply(403, { error: 'unit admins only' });
      this.enrolledTokens.add('device-token-1');
      return reply(200, { deviceId: 'device-1', deviceToken: 'device-token-1' });
    }
    if (url.pathname === '/api/me') {
      if (!this.enrolledTokens.has(init.headers['x-device-token'] ?? '')) return reply(403, { error: 'This tablet is not enrolled on your unit.', code: 'device-not-enrolled' });
      return reply(200, { user, device: { id: 'device-1', label: 'Tablet', enrolledAtMs: 0 } });
    }
    if (url.pathname === '/api/sync/push') {
      this.pushRequests += 1;
      const fault = this.faults.shift();
      if (fault?.kind === 'status') return reply(fault.status, { error: 'unavailable' });
      if (fault?.kind === 'delay') {
        // The request is stuck on the way: the tablet sees a failure now, the server gets it later.
        fault.onHeld(async () => {
          await this.push(body, undefined);
        });
        throw new TypeError('Failed to fetch');
      }
      const answer = await this.push(body, fault);
      return reply(answer.status, answer.body);
    }
    if (url.pathname === '/api/sync/pull') {
      this.pullRequests += 1;
      const answer = this.pull(url);
      return reply(answer.status, answer.body);
    }
    return reply(404, { error: 'not found' });
  };
}
