// The bench's baseline page: Preact rendering one element and Dexie opening a database, nothing
// else, built by the same Vite config as the tablet app so the two sizes compare like with like.
import Dexie from 'dexie';
import { render } from 'preact';

const db = new Dexie('bare-page');
db.version(1).stores({ items: 'id' });
void db.open();
render(<p>Bare page</p>, document.getElementById('app')!);
