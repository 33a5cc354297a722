import { render } from 'preact';
import { RhythmDb } from '../store/db.ts';
import { App } from './App.tsx';
import { startServiceWorker } from './sw-bridge.ts';
import './styles.css';

render(<App db={new RhythmDb()} />, document.getElementById('app')!);
startServiceWorker();
