import type { ServerConnection } from '../../sync/server-call.ts';
import { useCharting } from '../app-context.ts';
import { DecisionSupportNote } from '../components/DecisionSupportNote.tsx';
import { ServerConnect } from '../components/ServerConnect.tsx';
import { BedsEditor } from '../settings/BedsEditor.tsx';
import { CliniciansEditor } from '../settings/CliniciansEditor.tsx';
import { PolicyEditor } from '../settings/PolicyEditor.tsx';
import { WardSettingsForm } from '../settings/WardSettingsForm.tsx';
import { useLiveQuery } from '../use-live-query.ts';

/** Unit settings: the ward, its beds, the policy with sources and history, clinicians and this tablet. */
export function UnitSettings({ connection }: { /** The unit server; the page's own origin unless given. */ connection?: ServerConnection } = {}) {
  const { db, unit, policy, clinician, deviceId, sync, demoWard } = useCharting();
  const beds = useLiveQuery(() => db.beds.where('unitId').equals(unit.id).toArray(), [db, unit.id]);
  const waiting = useLiveQuery(() => db.outbox.where('status').anyOf('pending', 'sending').count(), [db]);
  const persisted = useLiveQuery(() => db.settings.get('persistentStorage'), [db]);
  const canEdit = clinician.role !== 'nurse';
  return (
    <section aria-labelledby="settings-title">
      <h1 id="settings-title">Unit settings</h1>
      {!canEdit ? <p class="sub">Only a charge nurse or unit admin can change settings; you can read them here.</p> : null}
      <DecisionSupportNote />
      <WardSettingsForm key={unit.updatedAtMs} db={db} unit={unit} canEdit={canEdit} />
      {beds ? <BedsEditor db={db} unitId={unit.id} beds={beds} canEdit={canEdit} /> : null}
      <PolicyEditor db={db} unit={unit} policy={policy} changedBy={clinician.name} canEdit={canEdit} />
      <CliniciansEditor db={db} canEdit={canEdit} />
      <section aria-labelledby="tablet-title">
        <h2 id="tablet-title">This tablet</h2>
        <ul>
          <li>Tablet id: {deviceId}</li>
          <li>Changes waiting for the unit server: {waiting ?? '…'}</li>
          <li>
            Storage kept by the browser:{' '}
            {persisted?.value === 'granted' ? 'yes' : 'not guaranteed (the browser may clear data under storage pressure; install the app to the home screen)'}
          </li>
        </ul>
        {sync && !demoWard && canEdit ? (
          <details>
            <summary>Connect this tablet to the unit server</summary>
            <ServerConnect db={db} sync={sync} {...(connection ? { connection } : {})} />
          </details>
        ) : null}
      </section>
    </section>
  );
}
