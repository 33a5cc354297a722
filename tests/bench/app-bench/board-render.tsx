// Renders the real beds board (and the read form's figures) in happy-dom over fake-indexeddb and
// prints the timings as one JSON line. Run by app-bench.ts in its own process, with the project's
// JSX settings (TSX_TSCONFIG_PATH), so the DOM globals stay out of the other benches.
import 'fake-indexeddb/auto';
import { Window } from 'happy-dom';
import { performance } from 'node:perf_hooks';

const happyWindow = new Window({ url: 'http://localhost/#/beds', width: 1280, height: 800 });
Object.assign(globalThis, { window: happyWindow, document: happyWindow.document, navigator: happyWindow.navigator });

// Imported after the DOM globals exist, as in a browser.
const { options, render } = await import('preact');
const { ChartingContext } = await import('../../../src/app/app-context.ts');
const { BedsBoard } = await import('../../../src/app/screens/BedsBoard.tsx');
const { FiguresPanel } = await import('../../../src/app/components/FiguresPanel.tsx');
const { FlagBanners } = await import('../../../src/app/components/FlagBanner.tsx');
const { boardRows } = await import('../../../src/app/board-rows.ts');
const { liveRead, newReadForm } = await import('../../../src/app/read-form-values.ts');
const { deriveRead } = await import('../../../src/core/read-derivation.ts');
const { loadBoardData } = await import('../../../src/store/board-query.ts');
const { RhythmDb } = await import('../../../src/store/db.ts');
const { unitPolicyOf } = await import('../../../src/store/unit-policy-of.ts');
const { median } = await import('../bench-helpers.ts');
const { benchUnit, benchWard } = await import('./bench-ward.ts');

type ClinicianRow = import('../../../src/store/db.ts').ClinicianRow;
type StoredRead = import('../../../src/store/db.ts').StoredRead;

// Effects run as soon as the render is done: the figures are the work, not the wait for a frame.
options.requestAnimationFrame = (callback: () => void) => void setTimeout(callback, 0);

const nowMs = Date.parse('2026-03-10T10:30:00Z');
const unit = benchUnit(nowMs);
const policy = unitPolicyOf(unit);
const nurse: ClinicianRow = { id: 'clin-bench-nurse', name: 'Bench Nurse', role: 'nurse', pinHash: 'x', pinSalt: 'x', pinIterations: 1, active: true, createdAtMs: 0 };
const nextTick = () => new Promise<void>((resolve) => setImmediate(resolve));

async function seededDb(bedCount: number, days: number) {
  const db = new RhythmDb(`bench-board-${bedCount}-${days}`);
  const ward = benchWard(unit, bedCount, days, nowMs);
  const reads: StoredRead[] = ward.flatMap(({ stay, reads }) =>
    reads.map((read) => {
      const derived = deriveRead(read, stay, undefined, policy);
      return { ...read, analysis: derived.ok ? derived.value : null, syncStatus: 'accepted' as const };
    }),
  );
  await db.units.put(unit);
  await db.beds.bulkPut(ward.map((w) => w.bed));
  await db.stays.bulkPut(ward.map((w) => w.stay));
  await db.reads.bulkPut(reads);
  return { db, readCount: reads.length };
}

async function timeBoard(bedCount: number, days: number) {
  const { db, readCount } = await seededDb(bedCount, days);
  const queryMs: number[] = [];
  const rowsMs: number[] = [];
  const mountMs: number[] = [];
  const rerenderMs: number[] = [];
  for (let round = 0; round < 9; round += 1) {
    let start = performance.now();
    const data = await loadBoardData(db, unit.id, nurse.id);
    queryMs.push(performance.now() - start);
    start = performance.now();
    boardRows(unit, data.beds, data.stays, policy, data.myDraftStayIds, nowMs);
    rowsMs.push(performance.now() - start);

    const container = document.createElement('div');
    document.body.appendChild(container);
    const board = (value: object) => (
      <ChartingContext.Provider value={{ db, deviceId: 'tablet-bench', unit, policy, clinician: nurse, demoWard: false, sync: null, ...value }}>
        <BedsBoard />
      </ChartingContext.Provider>
    );
    start = performance.now();
    render(board({}), container);
    while (container.querySelectorAll('li.bed-card').length < bedCount) await nextTick();
    mountMs.push(performance.now() - start);
    // A re-render with the data in hand (the clock ticking, or another read arriving): rows and DOM diff.
    start = performance.now();
    render(board({ deviceId: `tablet-bench-${round}` }), container);
    rerenderMs.push(performance.now() - start);
    render(null, container);
    container.remove();
  }
  db.close();
  return { bedCount, days, readCount, queryMs: median(queryMs), rowsMs: median(rowsMs), mountMs: median(mountMs), rerenderMs: median(rerenderMs) };
}

/** Typing a read key by key: the core's figures for the form, then the figures panel and banners re-rendered. */
function timeTyping() {
  const stay = benchWard(unit, 1, 1, nowMs)[0]!.stay;
  const keys: Array<[field: 'rr' | 'prSmallBoxes' | 'qrsSmallBoxes' | 'qtSmallBoxes', text: string]> = [
    ['rr', '2'], ['rr', '20'], ['prSmallBoxes', '4'], ['qrsSmallBoxes', '2'], ['qtSmallBoxes', '1'], ['qtSmallBoxes', '13'],
  ];
  const container = document.createElement('div');
  document.body.appendChild(container);
  const perKeyMs: number[] = [];
  for (let round = 0; round < 200; round += 1) {
    let form = newReadForm(unit, nowMs);
    for (const [field, text] of keys) {
      const start = performance.now();
      form = field === 'rr' ? { ...form, rrSmallBoxes: [text] } : { ...form, [field]: text };
      const live = liveRead(form, stay, undefined, policy);
      render(
        <>
          <FiguresPanel analysis={live.analysis} />
          <FlagBanners flags={live.analysis?.flags ?? []} />
        </>,
        container,
      );
      perKeyMs.push(performance.now() - start);
    }
  }
  render(null, container);
  const sorted = [...perKeyMs].sort((a, b) => a - b);
  return { keystrokes: perKeyMs.length, medianMs: median(perKeyMs), p99Ms: sorted[Math.floor(sorted.length * 0.99)] ?? Number.NaN };
}

// A discarded first pass, so the JIT and the store's first-open costs do not land on the first size.
await timeBoard(12, 1);
const boards = [];
for (const [bedCount, days] of [[12, 7], [24, 7], [48, 7], [48, 1]] as const) boards.push(await timeBoard(bedCount, days));
const typing = timeTyping();
console.log(`BENCH-RESULT ${JSON.stringify({ boards, typing })}`);
await happyWindow.happyDOM.close();
process.exit(0);
