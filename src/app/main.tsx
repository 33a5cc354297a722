import { render } from 'preact';

function Shell() {
  return (
    <main>
      <h1>Rhythm Ledger</h1>
      <p>Decision support only: verify every figure on the monitor and follow your unit's protocol.</p>
    </main>
  );
}

render(<Shell />, document.getElementById('app')!);
