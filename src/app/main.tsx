import { render } from 'preact';
import { RhythmDb } from '../store/db.ts';
import { createBrowserSyncEngine } from '../sync/browser-sync-engine.ts';
import { App } from './App.tsx';
import { startServiceWorker } from './sw-bridge.ts';
import './styles.css';
import './screens/handover/handover.css';
import './print/print.css';

const db = new RhythmDb();
// The app is served by the unit server, so the engine talks to the page's own origin.
const sync = createBrowserSyncEngine(db);
sync.start();
render(<App db={db} sync={sync} />, document.getElementById('app')!);
startServiceWorker();
