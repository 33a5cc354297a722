import { useMemo, useState } from 'preact/hooks';
import { ValidationError } from '../../../core/field-error.ts';
import type { AuditAccount, AuditDevice, AuditEvent, AuditFilter } from '../../../sync/audit-trail.ts';
import { browserConnection } from '../../../sync/browser-sync-engine.ts';
import type { ServerConnection } from '../../../sync/server-call.ts';
import { currentSession } from '../../../sync/server-session.ts';
import { ServerSignIn } from '../../../sync/ui/ServerSignIn.tsx';
import { useCharting } from '../../app-context.ts';
import { dayClockText } from '../../time-text.ts';
import { useLiveQuery } from '../../use-live-query.ts';
import { FormErrors } from '../../components/FormErrors.tsx';
import { auditDateRange, auditKindText, auditKindWords, tabletTimeGapText } from './audit-words.ts';
import { useAuditTrail } from './use-audit-trail.ts';
import './audit.css';

/** Events shown per page. */
export const auditPageSize = 50;

function whoText(event: AuditEvent, accounts: readonly AuditAccount[]): string {
  const account = event.userId ? accounts.find((a) => a.id === event.userId) : undefined;
  if (account) return `${account.name} (${account.username})`;
  return event.username ?? event.userId ?? '—';
}

function tabletText(event: AuditEvent, devices: readonly AuditDevice[]): string {
  if (!event.deviceId) return '—';
  return devices.find((d) => d.id === event.deviceId)?.label ?? event.deviceId;
}

function EventRow({ event, accounts, devices, timeZone }: { event: AuditEvent; accounts: readonly AuditAccount[]; devices: readonly AuditDevice[]; timeZone: string }) {
  const gap = tabletTimeGapText(event.clientTimeMs, event.serverTimeMs);
  return (
    <tr>
      <th scope="row">{dayClockText(event.serverTimeMs, timeZone)}</th>
      <td>{event.clientTimeMs === null ? '—' : dayClockText(event.clientTimeMs, timeZone)}{gap ? <span class="sub"> ({gap})</span> : null}</td>
      <td title={event.kind}>{auditKindText(event.kind)}</td>
      <td>{whoText(event, accounts)}</td>
      <td>{tabletText(event, devices)}</td>
      <td class="audit-record">{event.recordId ?? '—'}</td>
      <td>{event.detail ?? ''}</td>
    </tr>
  );
}

/**
 * The unit's audit trail for unit admins: who did what, to which record, from which tablet, by the
 * server's clock and the tablet's. It lives on the unit server only, so this screen needs the
 * network and a unit admin's server session; nothing of it is kept on the tablet.
 */
export function AuditTrail({ connection: given, pageSize = auditPageSize }: { connection?: ServerConnection; pageSize?: number }) {
  const { db, unit, clinician } = useCharting();
  const connection = useMemo(() => given ?? browserConnection(), [given]);
  const session = useLiveQuery(() => currentSession(db), [db]);
  const [kind, setKind] = useState('');
  const [userId, setUserId] = useState('');
  const [fromDate, setFromDate] = useState('');
  const [toDate, setToDate] = useState('');
  const [formErrors, setFormErrors] = useState<string[]>([]);
  const [filter, setFilter] = useState<AuditFilter>({});
  const adminSession = session?.user.role === 'unit-admin';
  const trail = useAuditTrail(db, connection, clinician.role === 'unit-admin' && adminSession ? filter : null, pageSize);

  if (clinician.role !== 'unit-admin') {
    return (
      <section aria-labelledby="audit-title">
        <h1 id="audit-title">Audit trail</h1>
        <p>The audit trail is for unit admins. Ask your unit admin if you need to know who did what.</p>
      </section>
    );
  }
  if (session === undefined) return <p class="loading">Opening the audit trail…</p>;
  if (!adminSession) {
    return (
      <section aria-labelledby="audit-title">
        <h1 id="audit-title">Audit trail</h1>
        <p>The audit trail is kept on the unit server. Reading it needs a unit admin signed in to the unit server on this tablet{session ? ` (now signed in: ${session.user.name}, ${session.user.role})` : ''}.</p>
        <ServerSignIn db={db} connection={connection} onDone={() => undefined} />
      </section>
    );
  }

  const apply = (event: Event) => {
    event.preventDefault();
    try {
      const range = auditDateRange(fromDate, toDate, unit.timeZone);
      setFormErrors([]);
      setFilter({ ...(kind ? { kind } : {}), ...(userId ? { userId } : {}), ...range });
    } catch (error) {
      setFormErrors(error instanceof ValidationError ? error.errors.map((e) => e.message) : ['The filter could not be read; check the dates.']);
    }
  };
  const { load, accounts, devices } = trail;

  return (
    <section class="audit" aria-labelledby="audit-title">
      <h1 id="audit-title">Audit trail</h1>
      <p class="sub">
        Every sign-in, read, amendment, handover, export, refused change and setting change on the unit server, newest first. It cannot be edited. Times are on the unit clock ({unit.timeZone}). Signed in to the unit server as{' '}
        {session.user.name}.
      </p>
      <form class="audit-filter inline-fields" onSubmit={apply} aria-label="Filter the audit trail">
        <label class="field">
          What happened
          <select value={kind} onChange={(e) => setKind(e.currentTarget.value)}>
            <option value="">Everything</option>
            {auditKindWords.map(([value, words]) => (
              <option key={value} value={value}>
                {words}
              </option>
            ))}
          </select>
        </label>
        <label class="field">
          Who
          <select value={userId} onChange={(e) => setUserId(e.currentTarget.value)}>
            <option value="">Everyone</option>
            {accounts.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name} ({a.username})
              </option>
            ))}
          </select>
        </label>
        <label class="field">
          From day
          <input type="date" value={fromDate} onInput={(e) => setFromDate(e.currentTarget.value)} />
        </label>
        <label class="field">
          To day (included)
          <input type="date" value={toDate} onInput={(e) => setToDate(e.currentTarget.value)} />
        </label>
        <button type="submit" class="button button-primary">
          Show events
        </button>
      </form>
      <FormErrors messages={formErrors} />
      {load.state === 'loading' ? <p class="loading" role="status">Asking the unit server…</p> : null}
      {load.state === 'failed' ? (
        <div class="problem" role="alert">
          <p>{load.offline ? <strong>Needs the unit server. </strong> : null}{load.message}</p>
          <button type="button" class="button" onClick={trail.retry}>
            Try again
          </button>
        </div>
      ) : null}
      {load.state === 'shown' ? (
        <>
          {load.page.events.length === 0 ? (
            <p>No events match this filter.</p>
          ) : (
            <table class="reads audit-table">
              <caption>
                Page {trail.pageNumber}: {load.page.events.length} {load.page.events.length === 1 ? 'event' : 'events'}
              </caption>
              <thead>
                <tr>
                  <th scope="col">Server time</th>
                  <th scope="col">Tablet time</th>
                  <th scope="col">What happened</th>
                  <th scope="col">Who</th>
                  <th scope="col">Tablet</th>
                  <th scope="col">Record</th>
                  <th scope="col">Details</th>
                </tr>
              </thead>
              <tbody>
                {load.page.events.map((event) => (
                  <EventRow key={event.id} event={event} accounts={accounts} devices={devices} timeZone={unit.timeZone} />
                ))}
              </tbody>
            </table>
          )}
          <div class="actions">
            <button type="button" class="button" disabled={!trail.canGoNewer} onClick={trail.newer}>
              Newer events
            </button>
            <button type="button" class="button" disabled={!trail.canGoOlder} onClick={trail.older}>
              Older events
            </button>
          </div>
        </>
      ) : null}
    </section>
  );
}
