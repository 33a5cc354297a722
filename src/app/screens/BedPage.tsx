import { useMemo, useState } from 'preact/hooks';
import { qtcFormulaNames } from '../../core/qtc.ts';
import { shiftAt } from '../../core/shifts.ts';
import { loadBedData } from '../../store/board-query.ts';
import { deriveStayReads } from '../../core/stay-reads.ts';
import { useCharting } from '../app-context.ts';
import { DecisionSupportNote } from '../components/DecisionSupportNote.tsx';
import { FlagBanners } from '../components/FlagBanner.tsx';
import { ReadRow } from '../components/ReadRow.tsx';
import { RefusedReadNote } from '../components/RefusedReadNote.tsx';
import { StayFacts } from '../components/StayFacts.tsx';
import { TrendPlot } from '../components/TrendPlot.tsx';
import { takeFlash } from '../flash-message.ts';
import { hrefOf } from '../routes.ts';
import { clockText, dayClockText } from '../time-text.ts';
import { trendSeries } from '../trend-series.ts';
import { useLiveQuery } from '../use-live-query.ts';
import { useNowMs } from '../use-now.ts';

/** One bed: the patient's facts, the latest read's flags, trends with policy limits, and the reads of this shift and before. */
export function BedPage({ bedId }: { bedId: string }) {
  const { db, unit, policy, clinician, sync, demoWard } = useCharting();
  const nowMs = useNowMs();
  const [flash] = useState(() => takeFlash());
  const data = useLiveQuery(() => loadBedData(db, bedId), [db, bedId]);
  const derived = useMemo(() => (data?.stay ? deriveStayReads(data.reads, data.amendments, data.stay, policy) : []), [data, policy]);

  if (!data) return <p class="loading">Opening the bed…</p>;
  if (!data.bed) return <p>This bed is not on this tablet. <a href={hrefOf({ screen: 'board' })}>Back to beds</a></p>;
  const { bed, stay } = data;
  if (!stay) {
    return (
      <section>
        <h1>{bed.label}</h1>
        <p>No patient is monitored on this bed.</p>
        <a class="button button-primary" href={hrefOf({ screen: 'start-monitoring', bedId })}>
          Start monitoring a patient
        </a>
      </section>
    );
  }
  const shift = shiftAt(nowMs, unit.shiftPattern, unit.timeZone);
  const newestFirst = [...derived].reverse();
  const thisShift = newestFirst.filter((d) => d.view.current.stripTimeMs >= shift.startMs);
  const before = newestFirst.filter((d) => d.view.current.stripTimeMs < shift.startMs);
  const latest = newestFirst[0];
  const series = trendSeries(derived, policy, stay.sex);
  const fromMs = Math.min(stay.startMs, derived[0]?.view.current.stripTimeMs ?? stay.startMs);
  const storedById = new Map(data.reads.map((r) => [r.id, r]));
  const latestStored = latest ? storedById.get(latest.view.read.id) : undefined;

  const table = (rows: typeof derived, caption: string) => (
    <table class="reads">
      <caption>{caption}</caption>
      <thead>
        <tr>
          <th scope="col">Strip time</th>
          <th scope="col">Rate (bpm)</th>
          <th scope="col">PR (ms)</th>
          <th scope="col">QRS (ms)</th>
          <th scope="col">QT (ms)</th>
          <th scope="col">QTc (ms)</th>
          <th scope="col">Rhythm</th>
          <th scope="col">Reason · by</th>
          <th scope="col">Flags</th>
          <th scope="col">Record</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((d) => (
          <ReadRow key={d.view.read.id} derived={d} stored={storedById.get(d.view.read.id)} timeZone={unit.timeZone} mine={d.view.read.authorId === clinician.id} />
        ))}
      </tbody>
    </table>
  );

  return (
    <section class="bed-page" aria-labelledby="bed-title">
      {flash ? (
        <p class="flash" role="status">
          {flash}
        </p>
      ) : null}
      <div class="screen-head bed-head">
        <div>
          <h1 id="bed-title">
            {bed.label}: {stay.alias}
          </h1>
          <StayFacts stay={stay} />
          {stay.notes ? <p class="stay-notes">{stay.notes}</p> : null}
          <p class="sub">Monitored since {dayClockText(stay.startMs, unit.timeZone)}</p>
        </div>
        <div class="bed-actions">
          <a class="button button-primary" href={hrefOf({ screen: 'new-read', bedId })}>
            New read
          </a>
          <a class="button" href={hrefOf({ screen: 'start-monitoring', bedId })}>
            Patient details
          </a>
        </div>
      </div>
      <DecisionSupportNote />
      <h2>Latest read {latest ? `(${clockText(latest.view.current.stripTimeMs, unit.timeZone)})` : ''}</h2>
      {latestStored?.syncStatus === 'rejected' ? <RefusedReadNote reason={latestStored.rejectReason} bedId={bedId} /> : null}
      {/* The demo ward and a tablet without a sync engine never send, so "waiting" would never end there. */}
      {latestStored?.syncStatus === 'pending' && sync && !demoWard ? (
        <p class="latest-waiting" role="note">
          This read is still waiting to send to the unit server. It is safe on this tablet; the sync line shows when it has gone.
        </p>
      ) : null}
      {latest ? latest.analysis && latest.analysis.flags.length > 0 ? <FlagBanners flags={latest.analysis.flags} /> : <p>No flags on the latest read.</p> : <p>No reads yet: a baseline read is due.</p>}
      <h2>Trends</h2>
      <p class="sub">Dashed lines are the unit policy limits (values on the right). QTc uses one formula throughout: {qtcFormulaNames[policy.defaultQtcFormula]}, the unit's choice.</p>
      <div class="trends">
        {series.map((s) => (
          <TrendPlot key={s.key} series={s} timeZone={unit.timeZone} fromMs={fromMs} toMs={nowMs} />
        ))}
      </div>
      <h2>Reads</h2>
      {table(thisShift, `This shift (${shift.name}, from ${clockText(shift.startMs, unit.timeZone)}): ${thisShift.length} ${thisShift.length === 1 ? 'read' : 'reads'}`)}
      {before.length > 0 ? table(before, `Earlier: ${before.length} ${before.length === 1 ? 'read' : 'reads'}`) : null}
    </section>
  );
}
